import type { ReactNode } from 'react';
import { Navigate, useLocation } from 'react-router-dom';
import type { AccountView } from '@shared/schemas/auth';
import { PageLoadError } from '@/components/ui/page-load-error';
import { PageSpinner } from '@/components/ui/spinner';
import { useMe } from '@/features/auth/api/get-me';
import { signInPath } from '@/lib/return-to';

/** Renders its children with the signed-in account; anyone else goes to sign-in and comes back here after. */
export function RequireAccount({ children }: { children: (account: AccountView) => ReactNode }) {
  const me = useMe();
  const location = useLocation();
  if (me.isPending) return <PageSpinner label="Checking your session…" />;
  if (me.isError && me.data === undefined) {
    return <PageLoadError title="Could not check your session" error={me.error} onRetry={() => me.refetch()} />;
  }
  if (!me.data) return <Navigate replace to={signInPath(location.pathname + location.search + location.hash)} />;
  return <>{children(me.data)}</>;
}
