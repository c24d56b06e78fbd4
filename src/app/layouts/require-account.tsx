import type { ReactNode } from 'react';
import { Navigate, useLocation } from 'react-router-dom';
import type { AccountView } from '@shared/schemas/auth';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { PageSpinner } from '@/components/ui/spinner';
import { useMe } from '@/features/auth/api/get-me';
import { errorMessage } from '@/lib/form-errors';
import { signInPath } from '@/lib/return-to';

/** Renders its children with the signed-in account; anyone else goes to sign-in and comes back here after. */
export function RequireAccount({ children }: { children: (account: AccountView) => ReactNode }) {
  const me = useMe();
  const location = useLocation();
  if (me.isPending) return <PageSpinner label="Checking your session…" />;
  if (me.isError && me.data === undefined) {
    return (
      <div className="mx-auto max-w-xl px-4 py-16">
        <Alert title="Could not check your session">
          <p>{errorMessage(me.error)}</p>
          <Button variant="secondary" size="sm" className="mt-3" onClick={() => me.refetch()}>
            Try again
          </Button>
        </Alert>
      </div>
    );
  }
  if (!me.data) return <Navigate replace to={signInPath(location.pathname + location.search + location.hash)} />;
  return <>{children(me.data)}</>;
}
