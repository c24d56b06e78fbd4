import { useState } from 'react';
import { Link } from 'react-router-dom';
import type { SavedPlacesView } from '@shared/schemas/places';
import { Alert } from '@/components/ui/alert';
import { Button, buttonClasses } from '@/components/ui/button';
import { EmptyState } from '@/components/ui/empty-state';
import { errorMessage } from '@/lib/form-errors';
import { useDeletePlace } from '../api/delete-place';
import { useSetPassReminders } from '../api/set-pass-reminders';

const coordinates = (lat: number, lon: number) =>
  `${Math.abs(lat).toFixed(2)}° ${lat < 0 ? 'S' : 'N'}, ${Math.abs(lon).toFixed(2)}° ${lon < 0 ? 'W' : 'E'}`;

export function SavedPlaces({ view }: { view: SavedPlacesView }) {
  const remove = useDeletePlace();
  const reminders = useSetPassReminders();
  // The box shows the reader's choice at once, not after the server answers; on an error it goes back to what is stored.
  const [wanted, setWanted] = useState<boolean | null>(null);
  return (
    <div className="space-y-6">
      <section aria-labelledby="reminders-heading" className="rounded-2xl border border-foil-700/60 bg-night-900/80 p-5">
        <h2 id="reminders-heading" className="font-bold text-foil-50">
          Pass reminders
        </h2>
        <label className="mt-3 flex cursor-pointer items-start gap-3">
          <input
            type="checkbox"
            className="mt-1 size-4 accent-amber-400"
            checked={wanted ?? view.passReminders}
            disabled={reminders.isPending}
            onChange={(e) => {
              setWanted(e.target.checked);
              reminders.mutate({ enabled: e.target.checked }, { onSettled: () => setWanted(null) });
            }}
          />
          <span>
            <span className="block font-semibold text-foil-100">E-mail me before a good pass over my saved places</span>
            <span className="block text-sm text-foil-400">
              About a day ahead, once per pass, when the craft will be visible and at least 40° high. Every reminder has a link to stop
              them.
            </span>
          </span>
        </label>
        {reminders.isError && (
          <Alert className="mt-3" title="Could not change reminders">
            {errorMessage(reminders.error)}
          </Alert>
        )}
      </section>

      {remove.isError && <Alert title="Could not delete the place">{errorMessage(remove.error)}</Alert>}
      {view.places.length === 0 ? (
        <EmptyState
          title="No saved places yet"
          description="Find passes for a place in sky watch, then save it there. Nothing is kept until you do."
          action={
            <Link to="/sky-watch" className={buttonClasses()}>
              Open sky watch
            </Link>
          }
        />
      ) : (
        <section aria-labelledby="places-heading" className="space-y-3">
          <h2 id="places-heading" className="font-bold text-foil-50">
            {view.places.length} of {view.max} places
          </h2>
          <ul className="divide-y divide-foil-800 rounded-2xl border border-foil-700/60 bg-night-900/80">
            {view.places.map((p) => (
              <li key={p.id} className="flex flex-wrap items-center justify-between gap-3 px-5 py-4" data-testid="saved-place">
                <div className="min-w-0">
                  <p className="font-semibold break-words text-foil-50">{p.name}</p>
                  <p className="text-sm text-foil-400">
                    {coordinates(p.latitudeDeg, p.longitudeDeg)} · times in {p.timeZone}
                  </p>
                </div>
                <div className="flex flex-wrap gap-2">
                  <Link
                    to={`/sky-watch?lat=${p.latitudeDeg}&lon=${p.longitudeDeg}`}
                    className={buttonClasses({ variant: 'secondary', size: 'sm' })}
                    aria-label={`Passes over ${p.name}`}
                  >
                    Passes
                  </Link>
                  <Button
                    size="sm"
                    variant="danger"
                    loading={remove.isPending && remove.variables === p.id}
                    onClick={() => remove.mutate(p.id)}
                    aria-label={`Delete ${p.name}`}
                  >
                    Delete
                  </Button>
                </div>
              </li>
            ))}
          </ul>
        </section>
      )}
    </div>
  );
}
