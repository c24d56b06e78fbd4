import type { ReactNode } from 'react';
import { Link } from 'react-router-dom';
import type { Role } from '@shared/schemas/auth';
import { buttonClasses } from '@/components/ui/button';
import { EmptyState } from '@/components/ui/empty-state';
import { useMe } from '@/features/auth/api/get-me';
import { hasAnyRole, roleLabels } from '@/lib/roles';

/** Inside the console layout the account is known; this hides a section from roles that cannot use it. */
export function RequireRoles({ roles, children }: { roles: readonly Role[]; children: ReactNode }) {
  const me = useMe();
  if (!hasAnyRole(me.data?.roles, roles)) {
    return (
      <>
        <h1 className="sr-only">Not available</h1>
        <EmptyState
          title="This section is not part of your roles"
          description={`It is open to: ${roles.map((r) => roleLabels[r]).join(', ')}.`}
          action={
            <Link to="/console" className={buttonClasses({ variant: 'secondary' })}>
              Back to the console
            </Link>
          }
        />
      </>
    );
  }
  return <>{children}</>;
}
