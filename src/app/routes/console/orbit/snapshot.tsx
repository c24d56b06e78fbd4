import { useParams } from 'react-router-dom';
import { Alert } from '@/components/ui/alert';
import { Card } from '@/components/ui/card';
import { Spinner } from '@/components/ui/spinner';
import { errorMessage } from '@/lib/form-errors';
import { isNotFoundError } from '@/lib/api-client';
import { NotFoundPage } from '../../not-found';
import { useSnapshot } from '@/features/orbit/api/snapshots';
import { OrbitDeskFrame } from '@/features/orbit/components/orbit-desk-frame';
import { SnapshotChartView } from '@/features/orbit/components/snapshot-chart-view';

export function Component() {
  const { snapshotId = '' } = useParams();
  const q = useSnapshot(snapshotId);
  if (q.isError && isNotFoundError(q.error)) return <NotFoundPage />;
  return (
    <OrbitDeskFrame title={q.data?.snapshot.title ?? 'Snapshot'} requireCraft={false}>
      {() =>
        q.isPending ? (
          <Spinner label="Loading the snapshot…" />
        ) : q.isError ? (
          <Alert title="Could not load the snapshot">{errorMessage(q.error)}</Alert>
        ) : (
          <Card>
            <SnapshotChartView data={q.data.snapshot.data} title={q.data.snapshot.title} caption={q.data.snapshot.caption} />
            <p className="mt-3 text-sm text-foil-300">
              Downloads:{' '}
              <a className="text-amber-300 underline" href={`/api/orbit/snapshots/${q.data.snapshot.id}/chart.png`} download>
                PNG
              </a>{' '}
              ·{' '}
              <a className="text-amber-300 underline" href={`/api/orbit/snapshots/${q.data.snapshot.id}/chart.svg`} download>
                SVG
              </a>
              {q.data.snapshot.isPublic && (
                <>
                  {' '}
                  · public link{' '}
                  <a className="text-amber-300 underline" href={q.data.snapshot.publicPath}>
                    {q.data.snapshot.publicPath}
                  </a>
                </>
              )}
            </p>
          </Card>
        )
      }
    </OrbitDeskFrame>
  );
}
