import type { TrendRateWindow } from '../types';
import { countOf, formatUtcDate, sci, signed } from '../format';

function Rate({
  label,
  value,
  interval,
  unit,
  digits = 3,
}: {
  label: string;
  value: number;
  interval?: [number, number];
  unit: string;
  digits?: number;
}) {
  return (
    <div className="rounded-xl border border-foil-800 bg-night-950/50 px-3 py-2">
      <dt className="text-xs font-semibold uppercase tracking-wide text-foil-400">{label}</dt>
      <dd className="mt-0.5 text-lg font-bold tabular-nums text-foil-50">
        {signed(value, digits)} <span className="text-sm font-semibold text-foil-300">{unit}</span>
      </dd>
      {interval && (
        <dd className="text-xs tabular-nums text-foil-400">
          95 %: {signed(interval[0], digits)} … {signed(interval[1], digits)}
        </dd>
      )}
    </div>
  );
}

/** The robust (Theil–Sen) rates over the chosen window, with their 95 % intervals. */
export function RatesPanel({ trend }: { trend: TrendRateWindow }) {
  const r = trend.rates,
    iv = trend.intervals;
  return (
    <section aria-labelledby="rates-heading">
      <h2 id="rates-heading" className="text-base font-bold text-foil-50">
        Rates {formatUtcDate(trend.window.fromMs)} – {formatUtcDate(trend.window.toMs)}
      </h2>
      {!r ? (
        <p className="mt-2 text-sm text-foil-400">Fewer than three element sets in this window: no rates.</p>
      ) : (
        <>
          <dl className="mt-3 grid grid-cols-2 gap-2 lg:grid-cols-4" data-testid="rates">
            <Rate label="Apogee" value={r.apogeeKmPerDay} interval={iv?.apogeeKmPerDay} unit="km/day" />
            <Rate label="Perigee" value={r.perigeeKmPerDay} interval={iv?.perigeeKmPerDay} unit="km/day" />
            <Rate label="Semi-major axis" value={r.semiMajorAxisKmPerDay} interval={iv?.semiMajorAxisKmPerDay} unit="km/day" />
            <Rate label="Orbital energy" value={r.energyJPerKgPerDay} interval={iv?.energyJPerKgPerDay} unit="J/kg/day" digits={0} />
          </dl>
          <p className="mt-2 text-sm text-foil-300">
            Equivalent along-track acceleration{' '}
            <span className="font-semibold tabular-nums text-foil-50">{sci(r.alongTrackAccelMPerS2)} m/s²</span> ·{' '}
            {countOf(trend.counts.used, 'set')} used, {countOf(trend.counts.outliers, 'outlier')} left out
            {trend.counts.duplicatesRemoved ? `, ${trend.counts.duplicatesRemoved} duplicates` : ''}.
          </p>
        </>
      )}
    </section>
  );
}
