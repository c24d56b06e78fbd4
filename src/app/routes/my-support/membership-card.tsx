import { useEffect, useRef } from 'react';
import { Link, useParams } from 'react-router-dom';
import { Alert } from '@/components/ui/alert';
import { PageHeader } from '@/components/ui/page-header';
import { PageSpinner } from '@/components/ui/spinner';
import { useOpenCardUpdate } from '@/features/my-support/api/open-card-update';
import { useDocumentTitle } from '@/lib/document-title';
import { errorMessage } from '@/lib/form-errors';
import { isNotFoundError } from '@/lib/api-client';
import { NotFoundPage } from '../not-found';

/** The update-card link in a failed-renewal e-mail lands here: we ask for a fresh processor page and go there. */
export function Component() {
  useDocumentTitle('Update your card');
  const { id = '' } = useParams();
  const open = useOpenCardUpdate();
  const asked = useRef(false);
  useEffect(() => {
    if (asked.current) return;
    asked.current = true;
    open.mutate(id, { onSuccess: (url) => window.location.assign(url) });
  }, [open, id]);
  if (open.isError && isNotFoundError(open.error)) return <NotFoundPage />;
  return (
    <>
      <PageHeader eyebrow="My support" title="Update your card" />
      {open.isError ? (
        <Alert title="Could not open the card page">
          <p>{errorMessage(open.error)}</p>
          <p className="mt-2">
            <Link to="/my-support/memberships" className="underline underline-offset-4">
              Back to memberships
            </Link>
          </p>
        </Alert>
      ) : (
        <PageSpinner label="Opening the payment processor’s card page…" />
      )}
    </>
  );
}
