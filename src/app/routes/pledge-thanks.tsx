import { Alert } from '@/components/ui/alert';
import { PageSpinner, Spinner } from '@/components/ui/spinner';
import { usePledge } from '@/features/pledges/api/get-pledge';
import { errorMessage } from '@/lib/form-errors';
import { isNotFoundError } from '@/lib/api-client';
import { NotFoundPage } from './not-found';
import { isPaidPledge, PledgeOutcome, PledgeOutcomePage } from '../layouts/pledge-outcome';

function Thanks({ id }: { id: string }) {
  // The processor sends us here first and tells our server by webhook; wait for that before saying "paid".
  const pledge = usePledge(id, { poll: true });
  if (pledge.isPending) return <PageSpinner />;
  if (pledge.isError && isNotFoundError(pledge.error)) return <NotFoundPage />;
  if (pledge.isError) return <Alert title="Could not load your pledge">{errorMessage(pledge.error)}</Alert>;
  const p = pledge.data;
  const paid = isPaidPledge(p);
  return (
    <PledgeOutcome
      pledge={p}
      title={paid ? 'Thank you — your pledge is in' : p.state === 'started' ? 'Confirming your payment…' : 'Your pledge is not paid'}
      notice={
        <>
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
          {(p.state === 'failed' || p.state === 'abandoned') && (
            <Alert title="The payment did not go through">{p.failureReason ?? 'No payment was taken.'}</Alert>
          )}
        </>
      }
      next={{ to: '/my-support/pledges', label: 'See my pledges' }}
    />
  );
}

export function Component() {
  return <PledgeOutcomePage documentTitle="Thank you">{(id) => <Thanks id={id} />}</PledgeOutcomePage>;
}
