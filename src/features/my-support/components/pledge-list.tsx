import { useRef } from 'react';
import { Link } from 'react-router-dom';
import { NO_GIFT_LABEL } from '@shared/schemas/campaign';
import { Alert } from '@/components/ui/alert';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { errorMessage } from '@/lib/form-errors';
import { pledgeStateLabels } from '@/lib/pledge-state';
import type { MyPledge } from '../api/get-my-pledges';
import { useRetryPledge } from '../api/retry-pledge';
import { dateFormat, money, stateTone } from '../format';

const paymentLabel = { charge: 'Payment', refund: 'Refund', dispute: 'Disputed by the card holder' } as const;

/** Attempts that ended without money (left, expired, closed after a decline) are folded away below the rest. */
const isEarlierAttempt = (p: MyPledge) => p.state === 'abandoned';

export function PledgeList({ pledges }: { pledges: MyPledge[] }) {
  const retry = useRetryPledge();
  // One attempt key per pledge while this page is open: a second click opens the same new checkout.
  const attemptKeys = useRef(new Map<string, string>());
  const tryAgain = (pledgeId: string) => {
    let attemptKey = attemptKeys.current.get(pledgeId);
    if (!attemptKey) {
      attemptKey = crypto.randomUUID();
      attemptKeys.current.set(pledgeId, attemptKey);
    }
    retry.mutate(
      { pledgeId, attemptKey },
      {
        onSuccess: ({ checkoutUrl }) => window.location.assign(checkoutUrl),
        onError: () => attemptKeys.current.delete(pledgeId),
      },
    );
  };
  const retrying = (id: string) => retry.isPending && retry.variables?.pledgeId === id;
  const current = pledges.filter((p) => !isEarlierAttempt(p));
  const earlier = pledges.filter(isEarlierAttempt);

  return (
    <div className="space-y-6">
      {retry.isError && <Alert title="Could not start a new attempt">{errorMessage(retry.error)}</Alert>}
      {current.length > 0 ? (
        <ul className="space-y-4">
          {current.map((p) => (
            <li key={p.id} className="rounded-2xl border border-foil-700/60 bg-night-900/80 p-5" data-testid="my-pledge">
              <PledgeHead pledge={p} />
              {p.failureReason && p.state === 'failed' && <p className="mt-2 text-sm text-amber-200">{p.failureReason}</p>}
              {p.state === 'failed' && (
                <div className="mt-3 flex flex-wrap items-center gap-3">
                  <Button size="sm" loading={retrying(p.id)} onClick={() => tryAgain(p.id)}>
                    Try again
                  </Button>
                  <span className="text-sm text-foil-400">Opens a new checkout for the same gift and amount.</span>
                </div>
              )}
              {p.checkoutUrl && p.state === 'started' && (
                <p className="mt-2 text-sm">
                  <a className="font-semibold text-amber-300 underline underline-offset-4" href={p.checkoutUrl}>
                    Finish paying
                  </a>
                </p>
              )}
              {p.payments.length > 0 && <PaymentsTable pledge={p} />}
            </li>
          ))}
        </ul>
      ) : (
        <p className="text-foil-300">No pledge went through yet; your earlier attempts are below.</p>
      )}
      {earlier.length > 0 && (
        <details className="group rounded-2xl border border-foil-800 bg-night-950/40" data-testid="earlier-attempts">
          <summary className="cursor-pointer list-none rounded-2xl px-5 py-3 font-semibold text-foil-200 hover:text-foil-50 focus-visible:outline-2 focus-visible:outline-amber-300 [&::-webkit-details-marker]:hidden">
            <span aria-hidden="true" className="mr-2 inline-block transition-transform group-open:rotate-90">
              ›
            </span>
            {earlier.length === 1 ? '1 earlier attempt' : `${earlier.length} earlier attempts`}
            <span className="ml-2 text-sm font-normal text-foil-400">left or closed without payment</span>
          </summary>
          <ul className="divide-y divide-foil-800 px-5 pb-3">
            {earlier.map((p) => (
              <li key={p.id} className="flex flex-wrap items-center justify-between gap-3 py-3" data-testid="earlier-attempt">
                <div className="min-w-0 text-sm">
                  <p className="font-semibold text-foil-100">
                    {p.tier?.title ?? NO_GIFT_LABEL} · {money(p.amountMinor, p.currency)}
                    {p.kind === 'monthly' && ' a month'}
                  </p>
                  <p className="text-foil-400">
                    {dateFormat.format(new Date(p.createdAt))} · {pledgeStateLabels[p.state]}
                    {p.failureReason && ` · ${p.failureReason}`} · nothing was taken
                  </p>
                </div>
                <Button size="sm" variant="secondary" loading={retrying(p.id)} onClick={() => tryAgain(p.id)}>
                  Try again
                </Button>
              </li>
            ))}
          </ul>
        </details>
      )}
    </div>
  );
}

function PledgeHead({ pledge: p }: { pledge: MyPledge }) {
  return (
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
  );
}

function PaymentsTable({ pledge: p }: { pledge: MyPledge }) {
  return (
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
  );
}
