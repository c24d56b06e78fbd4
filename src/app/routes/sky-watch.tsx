import { Alert } from '@/components/ui/alert';
import { Card } from '@/components/ui/card';
import { Spinner } from '@/components/ui/spinner';
import { useDocumentTitle } from '@/lib/document-title';
import { errorMessage } from '@/lib/form-errors';
import { MISSION_CRAFT_SLUG, useLatestSet } from '@/features/live-orbit/api/get-latest-set';
import { SkyWatch } from '@/features/live-orbit/components/sky-watch';
import { useMe } from '@/features/auth/api/get-me';
import { SavePlaceForm } from '@/features/my-support/components/save-place-form';
import { useLocation, useSearchParams } from 'react-router-dom';
import { observerPlaceSchema } from '@shared/schemas/sky-watch';

/** Sky watch: when the mission craft can be seen from a place, with the cautions every watcher needs. */
export function Component() {
  const q = useLatestSet(MISSION_CRAFT_SLUG);
  const name = q.data?.spacecraft.name ?? 'the craft';
  useDocumentTitle('Sky watch');
  const me = useMe();
  const location = useLocation();
  const [params] = useSearchParams();
  // ?lat=&lon= (from a saved place or a reminder e-mail) forecasts that place at once; anything else is ignored.
  const linked = observerPlaceSchema.safeParse({
    latitudeDeg: params.get('lat') || undefined,
    longitudeDeg: params.get('lon') || undefined,
  });
  return (
    <div className="mx-auto w-full max-w-5xl space-y-6 px-4 py-8 sm:px-6">
      <header className="space-y-2">
        <h1 className="text-2xl font-extrabold text-foil-50 sm:text-3xl">Sky watch</h1>
        <p className="text-foil-300">
          Its sail catches the sunlight: after dusk and before dawn, {name} can cross your sky as a moving point of light. Tell us where you
          are and we list the next chances to see it.
        </p>
      </header>
      <Alert title="Never look at or near the Sun" tone="warning">
        Not with your eyes, binoculars or a telescope: it can blind you in an instant. Passes are listed only when the Sun is below the
        horizon; keep it that way when you look. Times shift by minutes as the orbit decays, so check again on the day: the forecast is
        recomputed from the newest element set.
      </Alert>
      {q.isPending ? (
        <Spinner label="Loading the newest element set…" />
      ) : q.isError ? (
        <Alert title="The forecast cannot be made right now">{errorMessage(q.error)}</Alert>
      ) : !q.data.latest ? (
        <Alert title="No element set yet">The engineers have not published an element set for {name} yet.</Alert>
      ) : (
        <Card>
          <SkyWatch
            name={q.data.spacecraft.name}
            line1={q.data.latest.line1}
            line2={q.data.latest.line2}
            initialPlace={linked.success ? linked.data : null}
            afterPasses={(place) => (
              <SavePlaceForm place={place} signedIn={Boolean(me.data)} returnTo={`${location.pathname}${location.search}`} />
            )}
          />
        </Card>
      )}
      <p className="text-sm text-foil-400">{q.data?.caution}</p>
    </div>
  );
}
