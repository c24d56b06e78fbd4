import { Link, useParams } from 'react-router-dom';
import { ORBIT_CAUTION, SAIL_PERIODS_EXPLAINED, SERIES, SERIES_EXPLAINED } from '@shared/charts/snapshot-chart';
import { Alert } from '@/components/ui/alert';
import { Card } from '@/components/ui/card';
import { Spinner } from '@/components/ui/spinner';
import { useDocumentTitle } from '@/lib/document-title';
import { errorMessage } from '@/lib/form-errors';
import { isNotFoundError } from '@/lib/api-client';
import { NotFoundPage } from './not-found';
import { usePublicSnapshot } from '@/features/orbit/api/snapshots';
import { SnapshotChartView } from '@/features/orbit/components/snapshot-chart-view';

/** A published snapshot at its stable link, with what its lines mean and the way back to the mission. */
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
          <section aria-labelledby="reading-the-chart" className="mt-6 space-y-3 text-foil-100">
            <h2 id="reading-the-chart" className="text-lg font-bold">
              Reading this chart
            </h2>
            <ul className="list-disc space-y-2 pl-5">
              {q.data.snapshot.data.series.map((s) => (
                <li key={s}>
                  <span className="font-semibold" style={{ color: SERIES[s].color }}>
                    {SERIES[s].label}
                  </span>{' '}
                  ({SERIES[s].unit}): {SERIES_EXPLAINED[s]}
                </li>
              ))}
              {q.data.snapshot.data.sailingPeriods.length > 0 && <li>{SAIL_PERIODS_EXPLAINED}</li>}
              <li>Dashed lines show the average rate of change over the marked window, per day.</li>
            </ul>
            <p className="text-sm italic text-foil-300">{ORBIT_CAUTION}</p>
            <p>
              <Link className="font-semibold text-amber-300 underline" to="/">
                Back to the {q.data.snapshot.data.spacecraftName} mission
              </Link>
            </p>
          </section>
        </Card>
      )}
    </div>
  );
}
