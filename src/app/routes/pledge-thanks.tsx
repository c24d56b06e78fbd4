import { Link, useParams } from 'react-router-dom';
import { Alert } from '@/components/ui/alert';
import { buttonClasses } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { PageHeader } from '@/components/ui/page-header';
import { PageSpinner, Spinner } from '@/components/ui/spinner';
import { usePledge } from '@/features/pledges/api/get-pledge';
import { PledgeSummary } from '@/features/pledges/components/pledge-summary';
import { useDocumentTitle } from '@/lib/document-title';
import { errorMessage } from '@/lib/form-errors';
import { RequireAccount } from '../layouts/require-account';

function Thanks({ id }: { id: string }) {
  // The processor sends us here first and tells our server by webhook; wait for that before saying "paid".
  const pledge = usePledge(id, { poll: true });
  if (pledge.isPending) return <PageSpinner />;
  if (pledge.isError) return <Alert title="Could not load your pledge">{errorMessage(pledge.error)}</Alert>;
  const p = pledge.data;
  const paid = p.state === 'paid' || p.state === 'partly_refunded';
  return (
    <>
      <PageHeader eyebrow={p.campaign.title} title={paid ? 'Thank you — your pledge is in' : p.state === 'started' ? 'Confirming your payment…' : 'Your pledge is not paid'} />
      <Card className="space-y-5">
        {p.state === 'started' && (
          <div role="status" className="flex items-center gap-3 text-foil-200">
            <Spinner label={null} />
            The payment processor has sent you back; we are waiting for its confirmation. This takes a few seconds.
          </div>
        )}
        {paid && (
          <Alert tone="success" title="Payment confirmed">
            {p.kind === 'monthly' ? 'Welcome to the crew. ' : ''}A confirmation is on its way to your inbox.
          </Alert>
        )}
        {(p.state === 'failed' || p.state === 'abandoned') && <Alert title="The payment did not go through">{p.failureReason ?? 'No payment was taken.'}</Alert>}
        <PledgeSummary pledge={p} />
        <div className="flex flex-wrap gap-3">
          <Link to="/my-support/pledges" className={buttonClasses()}>
            See my pledges
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
  useDocumentTitle('Thank you');
  const { id = '' } = useParams();
  return (
    <div className="mx-auto max-w-2xl px-4 py-8 sm:px-6 md:py-12">
      <RequireAccount>{() => <Thanks id={id} />}</RequireAccount>
    </div>
  );
}
