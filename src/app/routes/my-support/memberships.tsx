import { Link } from 'react-router-dom';
import { Alert } from '@/components/ui/alert';
import { buttonClasses } from '@/components/ui/button';
import { EmptyState } from '@/components/ui/empty-state';
import { PageHeader } from '@/components/ui/page-header';
import { PageSpinner } from '@/components/ui/spinner';
import { useMemberships } from '@/features/my-support/api/get-memberships';
import { MembershipList } from '@/features/my-support/components/membership-list';
import { useDocumentTitle } from '@/lib/document-title';
import { errorMessage } from '@/lib/form-errors';

export function Component() {
  useDocumentTitle('Crew memberships');
  const memberships = useMemberships();
  return (
    <>
      <PageHeader
        eyebrow="My support"
        title="Crew memberships"
        description="Monthly support: when it renews, how to update your card, and how to stop it."
      />
      {memberships.isPending ? (
        <PageSpinner />
      ) : memberships.isError ? (
        <Alert title="Could not load your memberships">{errorMessage(memberships.error)}</Alert>
      ) : memberships.data.length === 0 ? (
        <EmptyState
          title="You are not a crew member yet"
          description="A crew membership is a monthly pledge. Crew members read every dispatch first."
          action={
            <Link to="/campaign" className={buttonClasses()}>
              See crew memberships
            </Link>
          }
        />
      ) : (
        <MembershipList memberships={memberships.data} />
      )}
    </>
  );
}
