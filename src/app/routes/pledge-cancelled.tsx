import { useEffect, useRef } from 'react';
import { Link, useParams } from 'react-router-dom';
import { Alert } from '@/components/ui/alert';
import { buttonClasses } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { PageHeader } from '@/components/ui/page-header';
import { PageSpinner } from '@/components/ui/spinner';
import { useCancelPledge } from '@/features/pledges/api/cancel-pledge';
import { PledgeSummary } from '@/features/pledges/components/pledge-summary';
import { useDocumentTitle } from '@/lib/document-title';
import { errorMessage } from '@/lib/form-errors';
import { RequireAccount } from '../layouts/require-account';

function Cancelled({ id }: { id: string }) {
  const cancel = useCancelPledge();
  const asked = useRef(false);
  useEffect(() => {
    // Closing the checkout gives a limited tier's slot back to other backers.
    if (asked.current) return;
    asked.current = true;
    cancel.mutate(id);
  }, [cancel, id]);
  if (cancel.isError) return <Alert title="Could not close the checkout">{errorMessage(cancel.error)}</Alert>;
  if (!cancel.data) return <PageSpinner label="Closing the checkout…" />;
  const p = cancel.data;
  const paid = p.state === 'paid' || p.state === 'partly_refunded';
  return (
    <>
      <PageHeader eyebrow={p.campaign.title} title={paid ? 'This pledge was paid after all' : 'No payment was taken'} />
      <Card className="space-y-5">
        {!paid && (
          <Alert tone={p.state === 'failed' ? 'error' : 'info'} title={p.state === 'failed' ? 'The card was not accepted' : 'You left the checkout'}>
            {p.failureReason ?? 'Nothing was charged.'}
          </Alert>
        )}
        <PledgeSummary pledge={p} />
        <div className="flex flex-wrap gap-3">
          <Link to={p.tier ? `/campaign/pledge?tier=${p.tier.id}` : '/campaign/pledge'} className={buttonClasses()}>
            Try again
          </Link>
          <Link to="/campaign" className={buttonClasses({ variant: 'secondary' })}>
            Back to the campaign
          </Link>
        </div>
      </Card>
    </>
  );
}

export function Component() {
  useDocumentTitle('Checkout cancelled');
  const { id = '' } = useParams();
  return (
    <div className="mx-auto max-w-2xl px-4 py-8 sm:px-6 md:py-12">
      <RequireAccount>{() => <Cancelled id={id} />}</RequireAccount>
    </div>
  );
}
