import { Link } from 'react-router-dom';
import type { TierView } from '@shared/schemas/campaign';
import { buttonClasses } from '@/components/ui/button';
import { money, monthYear } from '../format';

/** One thank-you gift (a reward tier), as a row: what ships, from how much, when, how many are left, and one clear action. */
export function ThankYouGift({ tier, currency, open }: { tier: TierView; currency: string; open: boolean }) {
  const price = money(tier.minAmountMinor, currency);
  const monthly = tier.kind === 'monthly';
  return (
    <li className="grid gap-3 border-t border-foil-800 py-5 first:border-t-0 md:grid-cols-[9rem_1fr_auto] md:items-start">
      <p className="text-lg font-bold text-amber-300">{monthly ? `${price} a month` : `from ${price}`}</p>
      <div className="min-w-0">
        <h3 id={`tier-${tier.id}`} className="font-bold text-foil-50">
          {tier.title}
        </h3>
        <p className="mt-1 text-sm text-foil-300">{tier.description}</p>
        <p className="mt-2 flex flex-wrap gap-x-4 gap-y-1 text-sm text-foil-400">
          {tier.estimatedDelivery && <span>Ships around {monthYear.format(new Date(tier.estimatedDelivery))}</span>}
          {tier.remaining !== null && tier.quantityLimit !== null && (
            <span>
              {tier.soldOut ? `All ${tier.quantityLimit} have gone` : `${tier.remaining} of ${tier.quantityLimit} still available`}
            </span>
          )}
          {monthly && <span>Renews each month until you stop it in My support</span>}
        </p>
      </div>
      {open && !tier.soldOut ? (
        <Link
          to={`/campaign/pledge?tier=${tier.id}`}
          className={buttonClasses({ variant: 'secondary' })}
          aria-describedby={`tier-${tier.id}`}
        >
          {monthly ? `Join the crew for ${price} a month` : `Pledge ${price} or more`}
        </Link>
      ) : (
        <p className="text-sm text-foil-400">{tier.soldOut ? 'None left' : 'Not open for pledges'}</p>
      )}
    </li>
  );
}
