import { Link, useParams } from 'react-router-dom';
import { ORBIT_CAUTION } from '@shared/charts/snapshot-chart';
import { Alert } from '@/components/ui/alert';
import { Card } from '@/components/ui/card';
import { Spinner } from '@/components/ui/spinner';
import { useDocumentTitle } from '@/lib/document-title';
import { errorMessage } from '@/lib/form-errors';
import { usePublicDispatch } from '@/features/dispatches/api/public-dispatches';

export function Component() {
  const { slug = '' } = useParams();
  const q = usePublicDispatch(slug);
  const d = q.data?.dispatch;
  useDocumentTitle(d?.title ?? 'Dispatch');
  return (
    <div className="mx-auto w-full max-w-3xl px-4 py-8 sm:px-6">
      {q.isPending ? (
        <Spinner label="Loading the dispatch…" />
      ) : q.isError || !d ? (
        <Alert title="This dispatch is not available">{errorMessage(q.error)}</Alert>
      ) : d.access === 'for-backers' ? (
        <Card>
          <h1 className="text-2xl font-bold">{d.title}</h1>
          <p className="mt-3">
            This dispatch is for backers ({d.audienceLabel.toLowerCase()}).{' '}
            {d.signedIn ? 'Your account is not in its audience.' : 'If you back the mission, sign in to read it.'}
          </p>
          <p className="mt-3 flex gap-4">
            {!d.signedIn && (
              <Link className="font-semibold text-amber-300 underline" to={`/sign-in?returnTo=/dispatches/${d.slug}`}>
                Sign in
              </Link>
            )}
            <Link className="font-semibold text-amber-300 underline" to="/campaign">
              Back the mission
            </Link>
          </p>
        </Card>
      ) : (
        <article>
          <h1 className="text-3xl font-bold">{d.title}</h1>
          <p className="text-sm text-foil-300">
            {new Date(d.publishedAt).toUTCString()} · {d.audienceLabel}
            {d.edited ? ' · edited after publishing' : ''}
          </p>
          {d.heroImagePath && <img className="mt-4 w-full rounded-xl" src={d.heroImagePath} alt={d.heroAlt} />}
          {/* Sanitised on the server (one sanitiser for web and e-mail). */}
          <div className="prose prose-invert mt-4 max-w-none" dangerouslySetInnerHTML={{ __html: d.bodyHtml }} />
          {d.charts.map((c) => (
            <figure key={c.snapshotId} className="mt-6">
              <img src={c.imagePath} alt={c.alt} className="w-full rounded-lg" />
              <figcaption className="mt-1 text-sm">{c.caption ? `${c.title}: ${c.caption}` : c.title}</figcaption>
              <p className="text-xs italic text-foil-300">{ORBIT_CAUTION}</p>
            </figure>
          ))}
        </article>
      )}
    </div>
  );
}
