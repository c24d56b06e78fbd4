import { ChartFrame } from '@/components/ui/chart-frame';
import type { OrbitSummary } from '../api/get-orbit-summary';

const day = new Intl.DateTimeFormat('en-GB', { day: 'numeric', month: 'short', year: 'numeric', timeZone: 'UTC' });
const km = (v: number) => `${Math.round(v).toLocaleString('en-US')} km`;
const signedKm = (v: number) => `${v >= 0 ? '+' : '−'}${Math.abs(v).toFixed(0)} km`;

function Stat({ term, value, note }: { term: string; value: string; note?: string }) {
  return (
    <div className="rounded-xl border border-foil-700/60 bg-night-950/40 px-3 py-2.5">
      <dt className="text-xs font-bold uppercase tracking-wider text-foil-400">{term}</dt>
      <dd className="mt-0.5 text-xl font-bold tabular-nums text-foil-50">{value}</dd>
      {note && <dd className="text-xs text-foil-400">{note}</dd>}
    </div>
  );
}

const W = 320;
const H = 150;
const PAD = { left: 40, right: 8, top: 8, bottom: 22 };

/** Apogee and perigee over the whole history as two lines, with the day the sail opened marked. */
function TrendLines({ trend, sailOpenedMs }: { trend: OrbitSummary['trend']; sailOpenedMs: number | null }) {
  const t0 = trend[0]!.epochMs;
  const t1 = trend[trend.length - 1]!.epochMs;
  const values = trend.flatMap((p) => [p.apogeeKm, p.perigeeKm]);
  const lo = Math.floor(Math.min(...values) / 10) * 10;
  const hi = Math.ceil(Math.max(...values) / 10) * 10;
  const x = (t: number) => PAD.left + ((t - t0) / Math.max(t1 - t0, 1)) * (W - PAD.left - PAD.right);
  const y = (v: number) => PAD.top + (1 - (v - lo) / Math.max(hi - lo, 1)) * (H - PAD.top - PAD.bottom);
  const line = (key: 'apogeeKm' | 'perigeeKm') => trend.map((p) => `${x(p.epochMs).toFixed(1)},${y(p[key]).toFixed(1)}`).join(' ');
  const showSail = sailOpenedMs !== null && sailOpenedMs > t0 && sailOpenedMs < t1;
  return (
    <svg viewBox={`0 0 ${W} ${H}`} className="h-auto w-full" role="presentation">
      {[lo, (lo + hi) / 2, hi].map((v) => (
        <g key={v}>
          <line x1={PAD.left} x2={W - PAD.right} y1={y(v)} y2={y(v)} className="stroke-foil-700" strokeDasharray="2 4" />
          <text x={PAD.left - 4} y={y(v) + 4} textAnchor="end" className="fill-foil-400" fontSize="11">
            {Math.round(v)}
          </text>
        </g>
      ))}
      {showSail && (
        <g>
          <line
            x1={x(sailOpenedMs)}
            x2={x(sailOpenedMs)}
            y1={PAD.top}
            y2={H - PAD.bottom}
            className="stroke-foil-400"
            strokeDasharray="4 3"
          />
          <text x={x(sailOpenedMs) + 4} y={PAD.top + 10} className="fill-foil-300" fontSize="11">
            sail opens
          </text>
        </g>
      )}
      <polyline points={line('apogeeKm')} fill="none" className="stroke-amber-400" strokeWidth="2.2" strokeLinejoin="round" />
      <polyline points={line('perigeeKm')} fill="none" className="stroke-night-300" strokeWidth="2.2" strokeLinejoin="round" />
      <text x={PAD.left} y={H - 5} className="fill-foil-400" fontSize="11">
        {day.format(t0)}
      </text>
      <text x={W - PAD.right} y={H - 5} textAnchor="end" className="fill-foil-400" fontSize="11">
        {day.format(t1)}
      </text>
    </svg>
  );
}

/** The sail yield in words a first-time visitor can follow. */
export function sailYieldWords(y: NonNullable<OrbitSummary['sailYield']>): string {
  const metres = y.semiMajorAxisKmPerDay * 1000;
  const spread = y.uncertaintyMPerS2 !== null && y.accelMPerS2 !== 0 ? Math.abs((metres * y.uncertaintyMPerS2) / y.accelMPerS2) : null;
  const basis = `measured over ${y.raisingPeriods} raising and ${y.edgeOnPeriods} edge-on ${y.raisingPeriods + y.edgeOnPeriods === 1 ? 'period' : 'periods'}`;
  if (metres <= 0 || (spread !== null && spread >= metres))
    return `So far the sail has not measurably lifted the orbit (${basis}): the difference between sailing and not sailing is smaller than the noise in the published data.`;
  return `With its sail turned to catch the sunlight, Tern-1 gains about ${Math.round(metres)} m of average height a day${
    spread !== null ? ` (give or take ${Math.round(spread)} m)` : ''
  } more than with the sail edge-on — ${basis}.`;
}

export function OrbitStatus({ summary }: { summary: OrbitSummary }) {
  const { latest, sinceSailDeployment: since, trend, sailYield } = summary;
  if (!latest) return <p className="text-foil-300">No element set has been published for {summary.spacecraft.name} yet.</p>;
  const sailOpenedMs = summary.spacecraft.sailDeployedAt ? Date.parse(summary.spacecraft.sailDeployedAt) : null;
  const first = trend[0];
  const last = trend[trend.length - 1];
  return (
    <div className="space-y-5">
      <dl className="grid grid-cols-2 gap-2">
        <Stat term="Apogee now" value={km(latest.apogeeKm)} note="highest point" />
        <Stat term="Perigee now" value={km(latest.perigeeKm)} note="lowest point" />
        <Stat
          term="Days sailing"
          value={since ? Math.floor(since.days).toLocaleString('en-US') : '—'}
          note={sailOpenedMs ? `since ${day.format(sailOpenedMs)}` : 'sail not open yet'}
        />
        <Stat
          term="Apogee gained"
          value={since ? signedKm(since.apogeeChangeKm) : '—'}
          note={since ? `perigee ${signedKm(since.perigeeChangeKm)}` : undefined}
        />
      </dl>
      <p className="text-xs text-foil-400">From the element set of {day.format(Date.parse(latest.epoch))} (UTC).</p>
      {first && last && trend.length > 1 && (
        <ChartFrame
          title="Apogee and perigee, whole mission"
          summary={
            <>
              <span className="mb-1 flex items-center gap-1.5" aria-hidden="true">
                <span className="inline-block h-0.5 w-4 bg-amber-400" /> apogee
                <span className="ml-3 inline-block h-0.5 w-4 bg-night-300" /> perigee
              </span>
              From {day.format(first.epochMs)} to {day.format(last.epochMs)} the apogee went from {km(first.apogeeKm)} to{' '}
              {km(last.apogeeKm)} and the perigee from {km(first.perigeeKm)} to {km(last.perigeeKm)}
              {sailOpenedMs ? `; the sail opened on ${day.format(sailOpenedMs)}` : ''}.
            </>
          }
          table={{
            caption: 'Apogee and perigee averaged over spans of the mission',
            columns: ['Date (UTC)', 'Apogee (km)', 'Perigee (km)', 'Element sets'],
            rows: trend.map((p) => [day.format(p.epochMs), p.apogeeKm.toFixed(1), p.perigeeKm.toFixed(1), p.sets]),
          }}
        >
          <TrendLines trend={trend} sailOpenedMs={sailOpenedMs} />
        </ChartFrame>
      )}
      <div>
        <h3 className="text-sm font-bold text-foil-100">Is the sail working?</h3>
        <p className="mt-1 text-foil-200">
          {sailYield ? sailYieldWords(sailYield) : 'Not measured yet: the engineers need both raising and edge-on periods to compare.'}
        </p>
      </div>
    </div>
  );
}
