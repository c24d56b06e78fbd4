import { useParams } from 'react-router-dom';
import { Alert } from '@/components/ui/alert';
import { Card } from '@/components/ui/card';
import { Spinner } from '@/components/ui/spinner';
import { useDocumentTitle } from '@/lib/document-title';
import { errorMessage } from '@/lib/form-errors';
import { isNotFoundError } from '@/lib/api-client';
import { NotFoundPage } from './not-found';
import { usePublicSnapshot } from '@/features/orbit/api/snapshots';
import { SnapshotChartView } from '@/features/orbit/components/snapshot-chart-view';

/** A published snapshot at its stable link. */
export function Component() {
  const { slug = '' } = useParams();
  const q = usePublicSnapshot(slug);
  useDocumentTitle(q.data?.snapshot.title ?? 'Snapshot');
  if (q.isError && isNotFoundError(q.error)) return <NotFoundPage />;
  return (
    <div className="mx-auto w-full max-w-5xl px-4 py-8 sm:px-6">
      {q.isPending ? (
        <Spinner label="Loading the snapshot…" />
      ) : q.isError ? (
        <Alert title="This snapshot is not available">{errorMessage(q.error)}</Alert>
      ) : (
        <Card>
          <h1 className="sr-only">{q.data.snapshot.title}</h1>
          <SnapshotChartView data={q.data.snapshot.data} title={q.data.snapshot.title} caption={q.data.snapshot.caption} />
          <p className="mt-3 text-sm text-foil-300">
            <a className="text-amber-300 underline" href={q.data.snapshot.pngPath} download>
              Download PNG
            </a>{' '}
            ·{' '}
            <a className="text-amber-300 underline" href={q.data.snapshot.svgPath} download>
              SVG
            </a>
          </p>
        </Card>
      )}
    </div>
  );
}
