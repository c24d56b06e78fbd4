import { Link } from 'react-router-dom';
import { NO_GIFT_LABEL } from '@shared/schemas/campaign';
import { Alert } from '@/components/ui/alert';
import { Card } from '@/components/ui/card';
import { EmptyState } from '@/components/ui/empty-state';
import { PageHeader } from '@/components/ui/page-header';
import { PageSpinner } from '@/components/ui/spinner';
import { useMyPledges } from '@/features/my-support/api/get-my-pledges';
import { dateFormat, money } from '@/features/my-support/format';
import { useDocumentTitle } from '@/lib/document-title';
import { errorMessage } from '@/lib/form-errors';

export function Component() {
  useDocumentTitle('Receipts');
  const pledges = useMyPledges();
  const payments = (pledges.data ?? [])
    .flatMap((p) => p.payments.filter((pay) => pay.kind !== 'dispute').map((pay) => ({ ...pay, pledge: p })))
    .sort((a, b) => b.occurredAt.localeCompare(a.occurredAt));
  return (
    <>
      <PageHeader eyebrow="My support" title="Receipts" description="One receipt per payment or refund." />
      {pledges.isPending ? (
        <PageSpinner />
      ) : pledges.isError ? (
        <Alert title="Could not load your receipts">{errorMessage(pledges.error)}</Alert>
      ) : payments.length === 0 ? (
        <EmptyState title="No payments yet" description="Receipts appear here once a pledge is paid." />
      ) : (
        <Card className="p-0 sm:p-0">
          <ul className="divide-y divide-foil-800">
            {payments.map((pay) => (
              <li key={pay.id}>
                <Link
                  to={`/my-support/receipts/${pay.id}`}
                  className="flex flex-wrap items-center justify-between gap-2 px-5 py-3 hover:bg-night-800/60"
                >
                  <span className="text-foil-100">
                    {pay.kind === 'refund' ? 'Refund' : 'Payment'} · {pay.pledge.tier?.title ?? NO_GIFT_LABEL}
                    <span className="block text-sm text-foil-400">{dateFormat.format(new Date(pay.occurredAt))}</span>
                  </span>
                  <span className="font-semibold tabular-nums text-foil-50">{money(pay.amountMinor, pay.currency)}</span>
                </Link>
              </li>
            ))}
          </ul>
        </Card>
      )}
    </>
  );
}
