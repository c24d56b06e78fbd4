import { Alert } from '@/components/ui/alert';
import { PageHeader } from '@/components/ui/page-header';
import { PageSpinner } from '@/components/ui/spinner';
import { useSavedPlaces } from '@/features/my-support/api/get-saved-places';
import { SavedPlaces } from '@/features/my-support/components/saved-places';
import { useDocumentTitle } from '@/lib/document-title';
import { errorMessage } from '@/lib/form-errors';

export function Component() {
  useDocumentTitle('Saved places');
  const places = useSavedPlaces();
  return (
    <>
      <PageHeader
        eyebrow="My support"
        title="Saved places"
        description="Places you saved from sky watch, and whether we e-mail you before a good pass over them."
      />
      {places.isPending ? (
        <PageSpinner label="Loading your places…" />
      ) : places.isError ? (
        <Alert title="Could not load your places">{errorMessage(places.error)}</Alert>
      ) : (
        <SavedPlaces view={places.data} />
      )}
    </>
  );
}
