import { Link } from 'react-router-dom';
import { NO_GIFT_LABEL } from '@shared/schemas/campaign';
import { Badge } from '@/components/ui/badge';
import { pledgeStateLabels } from '@/lib/pledge-state';
import type { MyPledge } from '../api/get-my-pledges';
import { dateFormat, money, stateTone } from '../format';

const paymentLabel = { charge: 'Payment', refund: 'Refund', dispute: 'Disputed by the card holder' } as const;

export function PledgeList({ pledges }: { pledges: MyPledge[] }) {
  return (
    <ul className="space-y-4">
      {pledges.map((p) => (
        <li key={p.id} className="rounded-2xl border border-foil-700/60 bg-night-900/80 p-5" data-testid="my-pledge">
          <div className="flex flex-wrap items-start justify-between gap-3">
            <div className="min-w-0">
              <p className="font-bold text-foil-50">
                {p.tier?.title ?? NO_GIFT_LABEL} · {money(p.amountMinor, p.currency)}
                {p.kind === 'monthly' && ' a month'}
              </p>
              <p className="text-sm text-foil-400">
                {p.campaign.title} · started {dateFormat.format(new Date(p.createdAt))} · shown as {p.publicName ?? 'anonymous'}
              </p>
            </div>
            <Badge tone={stateTone(p.state)}>{pledgeStateLabels[p.state]}</Badge>
          </div>
          {p.failureReason && (p.state === 'failed' || p.state === 'abandoned') && (
            <p className="mt-2 text-sm text-amber-200">{p.failureReason}</p>
          )}
          {p.checkoutUrl && p.state === 'started' && (
            <p className="mt-2 text-sm">
              <a className="font-semibold text-amber-300 underline underline-offset-4" href={p.checkoutUrl}>
                Finish paying
              </a>
            </p>
          )}
          {p.payments.length > 0 && (
            <table className="mt-4 w-full text-sm">
              <caption className="sr-only">Payments of this pledge</caption>
              <thead>
                <tr className="text-left text-xs uppercase tracking-wider text-foil-500">
                  <th scope="col" className="py-1 font-bold">
                    Date
                  </th>
                  <th scope="col" className="py-1 font-bold">
                    What
                  </th>
                  <th scope="col" className="py-1 text-right font-bold">
                    Amount
                  </th>
                  <th scope="col" className="py-1 text-right font-bold">
                    <span className="sr-only">Receipt</span>
                  </th>
                </tr>
              </thead>
              <tbody>
                {p.payments.map((pay) => (
                  <tr key={pay.id} className="border-t border-foil-800">
                    <td className="py-2 text-foil-300">{dateFormat.format(new Date(pay.occurredAt))}</td>
                    <td className="py-2 text-foil-100">{paymentLabel[pay.kind]}</td>
                    <td className="py-2 text-right font-semibold tabular-nums text-foil-50">{money(pay.amountMinor, pay.currency)}</td>
                    <td className="py-2 text-right">
                      {pay.kind !== 'dispute' && (
                        <Link to={`/my-support/receipts/${pay.id}`} className="font-semibold text-amber-300 underline underline-offset-4">
                          Receipt
                        </Link>
                      )}
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          )}
        </li>
      ))}
    </ul>
  );
}
