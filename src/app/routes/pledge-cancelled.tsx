import { useEffect, useRef } from 'react';
import { Alert } from '@/components/ui/alert';
import { PageSpinner } from '@/components/ui/spinner';
import { useCancelPledge } from '@/features/pledges/api/cancel-pledge';
import { errorMessage } from '@/lib/form-errors';
import { isNotFoundError } from '@/lib/api-client';
import { NotFoundPage } from './not-found';
import { isPaidPledge, PledgeOutcome, PledgeOutcomePage } from '../layouts/pledge-outcome';

function Cancelled({ id }: { id: string }) {
  const cancel = useCancelPledge();
  const asked = useRef(false);
  useEffect(() => {
    // Closing the checkout gives a limited tier's slot back to other backers.
    if (asked.current) return;
    asked.current = true;
    cancel.mutate(id);
  }, [cancel, id]);
  if (cancel.isError && isNotFoundError(cancel.error)) return <NotFoundPage />;
  if (cancel.isError) return <Alert title="Could not close the checkout">{errorMessage(cancel.error)}</Alert>;
  if (!cancel.data) return <PageSpinner label="Closing the checkout…" />;
  const p = cancel.data;
  const paid = isPaidPledge(p);
  return (
    <PledgeOutcome
      pledge={p}
      title={paid ? 'This pledge was paid after all' : 'No payment was taken'}
      notice={
        !paid && (
          <Alert
            tone={p.declined ? 'error' : 'info'}
            // A declined card whose checkout then closed ends `abandoned` (shared/pledge-states.ts); the decline is still the reason.
            title={p.declined ? 'The card was not accepted' : 'You left the checkout'}
          >
            {p.failureReason ?? 'Nothing was charged.'}
          </Alert>
        )
      }
      next={{ to: p.tier ? `/campaign/pledge?tier=${p.tier.id}` : '/campaign/pledge', label: 'Try again' }}
    />
  );
}

export function Component() {
  return <PledgeOutcomePage documentTitle="Checkout cancelled">{(id) => <Cancelled id={id} />}</PledgeOutcomePage>;
}
