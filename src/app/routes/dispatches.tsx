import { Link } from 'react-router-dom';
import { Alert } from '@/components/ui/alert';
import { Card } from '@/components/ui/card';
import { Spinner } from '@/components/ui/spinner';
import { useDocumentTitle } from '@/lib/document-title';
import { errorMessage } from '@/lib/form-errors';
import { useDispatchFeed } from '@/features/dispatches/api/public-dispatches';

/** The public feed of dispatches; ones for an audience the reader is not in are listed, marked "for backers". */
export function Component() {
  useDocumentTitle('Dispatches');
  const q = useDispatchFeed();
  return (
    <div className="mx-auto w-full max-w-3xl px-4 py-8 sm:px-6">
      <h1 className="text-3xl font-bold">Dispatches</h1>
      {q.isPending ? (
        <Spinner label="Loading dispatches…" />
      ) : q.isError ? (
        <Alert title="Dispatches could not load">{errorMessage(q.error)}</Alert>
      ) : q.data.dispatches.length === 0 ? (
        <p className="mt-4 text-foil-300">No dispatches yet.</p>
      ) : (
        <ul className="mt-6 space-y-4">
          {q.data.dispatches.map((d) => (
            <li key={d.slug}>
              <Card>
                <h2 className="text-xl font-bold">
                  <Link className="text-amber-300 underline" to={`/dispatches/${d.slug}`}>
                    {d.title}
                  </Link>
                </h2>
                <p className="text-sm text-foil-300">
                  {new Date(d.publishedAt).toUTCString()} · {d.locked ? `For backers (${d.audienceLabel.toLowerCase()})` : d.audienceLabel}
                </p>
                {d.excerpt && <p className="mt-2">{d.excerpt}</p>}
              </Card>
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}
