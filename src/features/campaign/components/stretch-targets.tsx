import type { StretchTargetView } from '@shared/schemas/campaign';
import { money } from '../format';

export function StretchTargets({ targets, currency }: { targets: StretchTargetView[]; currency: string }) {
  if (targets.length === 0) return null;
  return (
    <section aria-labelledby="stretch-title">
      <h2 id="stretch-title" className="text-xl font-bold text-foil-50">
        Stretch targets
      </h2>
      <ol className="mt-3 space-y-3">
        {targets.map((t) => (
          <li key={t.id} className="flex gap-3 rounded-xl border border-foil-800 bg-night-900/60 p-4">
            <span
              aria-hidden="true"
              className={
                t.reached ? 'mt-1 size-3 shrink-0 rotate-45 bg-amber-400' : 'mt-1 size-3 shrink-0 rotate-45 border border-foil-500'
              }
            />
            <div className="min-w-0">
              <p className="font-semibold text-foil-50">
                {money(t.amountMinor, currency)} · {t.title}
                {t.reached && <span className="ml-2 text-sm font-bold text-amber-300">reached</span>}
              </p>
              {t.description && <p className="mt-0.5 text-sm text-foil-400">{t.description}</p>}
            </div>
          </li>
        ))}
      </ol>
    </section>
  );
}
