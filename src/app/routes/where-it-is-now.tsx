import { Alert } from '@/components/ui/alert';
import { Card } from '@/components/ui/card';
import { Spinner } from '@/components/ui/spinner';
import { useDocumentTitle } from '@/lib/document-title';
import { errorMessage } from '@/lib/form-errors';
import { MISSION_CRAFT_SLUG, useLatestSet } from '@/features/live-orbit/api/get-latest-set';
import { WhereItIsNow } from '@/features/live-orbit/components/where-it-is-now';
import { Link } from 'react-router-dom';

/** Where it is now: the mission craft on a world map, updating while the page is open. */
export function Component() {
  const q = useLatestSet(MISSION_CRAFT_SLUG);
  const name = q.data?.spacecraft.name ?? 'The craft';
  useDocumentTitle(`Where ${name} is now`);
  return (
    <div className="mx-auto w-full max-w-5xl space-y-6 px-4 py-8 sm:px-6">
      <header className="space-y-2">
        <h1 className="text-2xl font-extrabold text-foil-50 sm:text-3xl">Where {name} is now</h1>
        <p className="text-foil-300">
          Its position over the Earth, its path for the next two orbits, and whether it is in sunlight, worked out in your browser from the
          newest published element set. Want to see it yourself?{' '}
          <Link to="/sky-watch" className="text-amber-300 underline">
            Find when it passes over you
          </Link>
          .
        </p>
      </header>
      {q.isPending ? (
        <Spinner label="Loading the newest element set…" />
      ) : q.isError ? (
        <Alert title="The position cannot be shown right now">{errorMessage(q.error)}</Alert>
      ) : !q.data.latest ? (
        <Alert title="No element set yet">The engineers have not published an element set for {name} yet.</Alert>
      ) : (
        <Card>
          <WhereItIsNow name={name} {...q.data.latest} />
        </Card>
      )}
      <p className="text-sm text-foil-400">{q.data?.caution}</p>
    </div>
  );
}
