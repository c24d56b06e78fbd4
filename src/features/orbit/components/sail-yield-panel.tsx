import { Alert } from '@/components/ui/alert';
import { Card, CardHeader } from '@/components/ui/card';
import { Spinner } from '@/components/ui/spinner';
import { errorMessage } from '@/lib/form-errors';
import { useSailYield } from '../api/get-sail-yield';
import { formatUtcDate, sci } from '../format';
import type { SailYield } from '../types';

const pct = (v: number) => `${(v * 100).toFixed(0)} %`;

/** Its own list, or (`inList`) one more term of the panel's list: a <dl> directly inside a <dl> is not valid. */
function LifetimeRow({ lifetime, inList = false }: { lifetime: NonNullable<SailYield['lifetime']>; inList?: boolean }) {
  const Wrapper = inList ? 'div' : 'dl';
  return (
    <Wrapper className="mt-3 text-sm">
      <dt className="text-foil-400">Lifetime estimate — {lifetime.basis}</dt>
      <dd className="tabular-nums text-foil-100">
        {[lifetime.low, lifetime.mean, lifetime.high]
          .map(
            (l) =>
              `solar activity ${l.activity}: ${l.exceedsHorizon ? 'beyond 100 years' : l.reentryIso ? formatUtcDate(Date.parse(l.reentryIso)) : '—'}`,
          )
          .join(' · ')}
      </dd>
    </Wrapper>
  );
}

/** Measured sail yield (raising minus edge-on) against the model at the current altitude. */
export function SailYieldPanel({ spacecraftId }: { spacecraftId: string }) {
  const q = useSailYield(spacecraftId);
  if (q.isPending)
    return (
      <Card>
        <Spinner label="Working out the sail yield…" />
      </Card>
    );
  if (q.isError) return <Alert title="Could not work out the sail yield">{errorMessage(q.error)}</Alert>;
  const { comparison: c, model, lifetime, caution } = q.data;
  const mean = model?.byActivity.find((b) => b.activity === 'mean');
  if (!q.data.sailApplies || !c)
    return (
      <Card data-testid="sail-yield">
        <CardHeader level={2} title="Sail yield" />
        <p className="text-sm text-foil-200" data-testid="sail-not-applicable">
          {q.data.spacecraft.name} has no sail (sail area 0 m²), so the sail yield, the crossover altitude and the sailing periods do not
          apply to it. Its orbit decays by drag alone.
        </p>
        {lifetime && <LifetimeRow lifetime={lifetime} />}
        <p className="mt-4 rounded-lg border border-amber-500/50 bg-amber-950/30 px-3 py-2 text-xs text-amber-100" role="note">
          {caution}
        </p>
      </Card>
    );
  return (
    <Card data-testid="sail-yield">
      <CardHeader
        level={2}
        title="Sail yield"
        description="Energy rate while raising minus while edge-on, as an equivalent along-track acceleration."
      />
      <dl className="space-y-3 text-sm">
        <div>
          <dt className="text-foil-400">Measured from the sailing periods</dt>
          <dd className="text-xl font-bold tabular-nums text-amber-300">
            {c.sailYieldMPerS2 === null ? '—' : `${sci(c.sailYieldMPerS2)} m/s²`}
            {c.uncertaintyMPerS2 !== null && (
              <span className="ml-1 text-sm font-semibold text-foil-300">± {sci(c.uncertaintyMPerS2, 1)}</span>
            )}
          </dd>
          <dd className="text-xs text-foil-400">
            {c.raising.periodCount} raising and {c.off.periodCount} edge-on periods{c.notes.length ? ` · ${c.notes.join('; ')}` : ''}
          </dd>
        </div>
        {model && mean && (
          <>
            <div>
              <dt className="text-foil-400">
                Model at {model.altitudeKm.toFixed(0)} km ({formatUtcDate(model.atEpochMs)}, mean activity)
              </dt>
              <dd className="tabular-nums text-foil-100">Expected sail acceleration {sci(mean.expectedSailAccelMPerS2)} m/s²</dd>
              <dd className="tabular-nums text-foil-100">
                Drag while raising {sci(mean.dragAccelRaisingMPerS2)} m/s² · edge-on {sci(mean.dragAccelEdgeOnMPerS2)} m/s²
              </dd>
            </div>
            <div>
              <dt className="text-foil-400">Crossover altitude (sail gain = drag loss)</dt>
              <dd className="tabular-nums text-foil-100">
                {model.byActivity
                  .map(
                    (b) =>
                      `solar activity ${b.activity}: ${b.crossoverAltitudeKm === null ? '—' : `${b.crossoverAltitudeKm.toFixed(0)} km`}`,
                  )
                  .join(' · ')}
              </dd>
            </div>
            <div>
              <dt className="text-foil-400">Sunlight (β = {model.betaDeg.toFixed(1)}°)</dt>
              <dd className="tabular-nums text-foil-100">
                Sunlit {pct(model.sunlitFraction)} of the orbit · usable for thrust {pct(model.usableThrustFraction)}
              </dd>
            </div>
          </>
        )}
        {lifetime && <LifetimeRow lifetime={lifetime} inList />}
      </dl>
      <p className="mt-4 rounded-lg border border-amber-500/50 bg-amber-950/30 px-3 py-2 text-xs text-amber-100" role="note">
        {caution}
      </p>
    </Card>
  );
}
