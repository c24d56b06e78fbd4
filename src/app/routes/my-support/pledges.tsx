import { Link } from 'react-router-dom';
import { Alert } from '@/components/ui/alert';
import { buttonClasses } from '@/components/ui/button';
import { EmptyState } from '@/components/ui/empty-state';
import { PageHeader } from '@/components/ui/page-header';
import { PageSpinner } from '@/components/ui/spinner';
import { useMyPledges } from '@/features/my-support/api/get-my-pledges';
import { PledgeList } from '@/features/my-support/components/pledge-list';
import { useDocumentTitle } from '@/lib/document-title';
import { errorMessage } from '@/lib/form-errors';

export function Component() {
  useDocumentTitle('My pledges');
  const pledges = useMyPledges();
  return (
    <>
      <PageHeader
        eyebrow="My support"
        title="Pledges"
        description="Every pledge you made, what was paid and refunded, and a receipt for each payment."
      />
      {pledges.isPending ? (
        <PageSpinner />
      ) : pledges.isError ? (
        <Alert title="Could not load your pledges">{errorMessage(pledges.error)}</Alert>
      ) : pledges.data.length === 0 ? (
        <EmptyState
          title="No pledges yet"
          description="When you back the mission, your pledge and its receipts show up here."
          action={
            <Link to="/campaign" className={buttonClasses()}>
              See the campaign
            </Link>
          }
        />
      ) : (
        <PledgeList pledges={pledges.data} />
      )}
    </>
  );
}
