import { Link } from 'react-router-dom';
import type { TierView } from '@shared/schemas/campaign';
import { Badge } from '@/components/ui/badge';
import { buttonClasses } from '@/components/ui/button';
import { money, monthYear } from '../format';

export function TierCard({ tier, currency, open }: { tier: TierView; currency: string; open: boolean }) {
  const price = money(tier.minAmountMinor, currency);
  return (
    <article aria-labelledby={`tier-${tier.id}`} className="flex flex-col rounded-2xl border border-foil-700/60 bg-night-900/70 p-5">
      <div className="flex flex-wrap items-start justify-between gap-2">
        <h3 id={`tier-${tier.id}`} className="text-lg font-bold text-foil-50">
          {tier.title}
        </h3>
        {tier.kind === 'monthly' ? (
          <Badge tone="good">Monthly</Badge>
        ) : (
          tier.quantityLimit !== null && <Badge tone="attention">Limited</Badge>
        )}
      </div>
      <p className="mt-1 text-xl font-bold text-amber-300">{tier.kind === 'monthly' ? `${price} a month` : `${price} or more`}</p>
      <p className="mt-3 flex-1 text-sm text-foil-300">{tier.description}</p>
      <dl className="mt-4 space-y-1 text-sm">
        {tier.remaining !== null && (
          <div className="flex justify-between gap-2">
            <dt className="text-foil-400">Left</dt>
            <dd className="font-semibold text-foil-100">
              {tier.soldOut ? 'None — all taken' : `${tier.remaining} of ${tier.quantityLimit}`}
            </dd>
          </div>
        )}
        {tier.estimatedDelivery && (
          <div className="flex justify-between gap-2">
            <dt className="text-foil-400">Estimated delivery</dt>
            <dd className="font-semibold text-foil-100">{monthYear.format(new Date(tier.estimatedDelivery))}</dd>
          </div>
        )}
      </dl>
      {open && !tier.soldOut ? (
        <Link to={`/campaign/pledge?tier=${tier.id}`} className={buttonClasses({ className: 'mt-5' })} aria-describedby={`tier-${tier.id}`}>
          {tier.kind === 'monthly' ? 'Join the crew' : 'Pledge'}
        </Link>
      ) : (
        <p className="mt-5 rounded-lg border border-foil-800 px-3 py-2 text-center text-sm text-foil-400">
          {tier.soldOut ? 'Sold out' : 'Not open for pledges'}
        </p>
      )}
    </article>
  );
}
