import { Link, useParams } from 'react-router-dom';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { PageHeader } from '@/components/ui/page-header';
import { PageSpinner } from '@/components/ui/spinner';
import { useReceipt } from '@/features/my-support/api/get-receipt';
import { dateTimeFormat, money } from '@/features/my-support/format';
import { useDocumentTitle } from '@/lib/document-title';
import { errorMessage } from '@/lib/form-errors';
import { isNotFoundError } from '@/lib/api-client';
import { NotFoundPage } from '../not-found';

export function Component() {
  const { entryId = '' } = useParams();
  const receipt = useReceipt(Number(entryId));
  useDocumentTitle(receipt.data ? `Receipt ${receipt.data.number}` : 'Receipt');
  if (receipt.isPending) return <PageSpinner />;
  if (receipt.isError && isNotFoundError(receipt.error)) return <NotFoundPage />;
  if (receipt.isError) return <Alert title="Could not load this receipt">{errorMessage(receipt.error)}</Alert>;
  const r = receipt.data;
  const refund = r.kind === 'refund';
  return (
    <>
      <PageHeader
        eyebrow="My support · Receipts"
        title={refund ? 'Refund receipt' : 'Payment receipt'}
        actions={
          <div className="flex flex-wrap gap-2">
            {!refund && (
              <a
                href={`/api/receipts/by-payment/${entryId}.pdf`}
                download
                className="inline-flex items-center rounded-md bg-amber-400 px-3 py-1.5 text-sm font-bold text-night-950 underline-offset-4 hover:underline focus-visible:outline focus-visible:outline-2 focus-visible:outline-amber-200"
              >
                Download PDF receipt
              </a>
            )}
            <Button variant="secondary" size="sm" onClick={() => window.print()}>
              Print
            </Button>
          </div>
        }
      />
      <Card className="max-w-2xl">
        <dl className="grid grid-cols-[auto_1fr] gap-x-8 gap-y-3 text-sm">
          <dt className="text-foil-400">Reference</dt>
          <dd className="font-mono text-foil-50">{r.number}</dd>
          <dt className="text-foil-400">{refund ? 'Refunded to' : 'Received from'}</dt>
          <dd className="text-foil-100">{r.backerName}</dd>
          <dt className="text-foil-400">For</dt>
          <dd className="text-foil-100">
            {r.campaign.title}
            {r.tier && ` — ${r.tier}`}
            {r.pledgeKind === 'monthly' && ' (monthly)'}
          </dd>
          <dt className="text-foil-400">Amount</dt>
          <dd className="text-lg font-bold text-foil-50">{money(Math.abs(r.amountMinor), r.currency)}</dd>
          <dt className="text-foil-400">Date</dt>
          <dd className="text-foil-100">{dateTimeFormat.format(new Date(r.occurredAt))}</dd>
          <dt className="text-foil-400">Processor reference</dt>
          <dd className="break-all font-mono text-foil-300">{r.processorId}</dd>
        </dl>
        <p className="mt-6 border-t border-foil-800 pt-4 text-sm text-foil-400">
          This receipt shows what you paid and when. It is not tax advice: whether any of it counts for tax depends on where you live, so
          follow your local rules and ask a licensed tax adviser.
        </p>
        <p className="mt-4 text-sm">
          <Link to="/my-support/pledges" className="text-amber-300 underline underline-offset-4">
            Back to my pledges
          </Link>
        </p>
      </Card>
    </>
  );
}
