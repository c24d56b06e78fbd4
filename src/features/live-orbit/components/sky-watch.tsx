import { useMemo, useState, type ReactNode } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { observerPlaceSchema, type ObserverPlace } from '@shared/schemas/sky-watch';
import { findVisiblePasses, type VisiblePass } from '@shared/orbit/passes';
import { createSatrec } from '@shared/orbit/sgp4-altitude';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Table, TBody, THead, Td, Th, Tr } from '@/components/ui/table';
import { TextField, inputClasses } from '@/components/ui/text-field';
import { passCalendarFile } from '../calendar';
import { PLACES, formatLatLon } from '../places';

type In = z.input<typeof observerPlaceSchema>;
const DAYS = 10;
const zone = Intl.DateTimeFormat().resolvedOptions().timeZone;
const dayFormat = new Intl.DateTimeFormat(undefined, { weekday: 'short', day: 'numeric', month: 'short' });
const timeFormat = new Intl.DateTimeFormat(undefined, { hour: '2-digit', minute: '2-digit', second: '2-digit' });

function download(blob: Blob, filename: string) {
  const url = URL.createObjectURL(blob);
  const a = document.createElement('a');
  a.href = url;
  a.download = filename;
  a.click();
  URL.revokeObjectURL(url);
}

function where(p: VisiblePass['start']) {
  return `${Math.round(p.elevationDeg)}° up in the ${p.compass}`;
}

/** A pass that ends high in the sky ends because the craft enters the Earth's shadow: it fades there. */
function fades(p: VisiblePass) {
  return p.end.elevationDeg > 11;
}

/** The visible passes over a place for the next ten days, computed in the browser: the place never leaves it. */
export function SkyWatch({
  name,
  line1,
  line2,
  initialPlace = null,
  afterPasses,
}: {
  name: string;
  line1: string;
  line2: string;
  /** A place to forecast at once (a link from a saved place or a reminder e-mail). */
  initialPlace?: ObserverPlace | null;
  /** Shown under the forecast for the chosen place (e.g. saving it, which this feature does not do itself). */
  afterPasses?: (place: ObserverPlace & { name: string }) => ReactNode;
}) {
  const [place, setPlace] = useState<(ObserverPlace & { name: string }) | null>(() =>
    initialPlace ? { ...initialPlace, name: formatLatLon(initialPlace.latitudeDeg, initialPlace.longitudeDeg) } : null,
  );
  const [geoError, setGeoError] = useState<string | null>(null);
  const [calendarError, setCalendarError] = useState<string | null>(null);
  const form = useForm<In, unknown, ObserverPlace>({
    resolver: zodResolver(observerPlaceSchema),
    defaultValues: { latitudeDeg: initialPlace?.latitudeDeg ?? '', longitudeDeg: initialPlace?.longitudeDeg ?? '' },
  });
  const satrec = useMemo(() => createSatrec({ line1, line2 }), [line1, line2]);
  const fromMs = useMemo(() => Math.floor(Date.now() / 60_000) * 60_000, []);
  const passes = useMemo(
    () => (place ? findVisiblePasses({ satrec, observer: place, fromMs, toMs: fromMs + DAYS * 86_400_000 }) : []),
    [place, satrec, fromMs],
  );

  const choose = (p: ObserverPlace, placeName: string) => {
    form.reset({ latitudeDeg: p.latitudeDeg, longitudeDeg: p.longitudeDeg });
    setPlace({ ...p, name: placeName });
  };

  const useMyPosition = () => {
    setGeoError(null);
    if (!('geolocation' in navigator)) return setGeoError('This browser cannot tell its position: pick a place or type its coordinates.');
    navigator.geolocation.getCurrentPosition(
      (pos) =>
        choose(
          { latitudeDeg: Math.round(pos.coords.latitude * 100) / 100, longitudeDeg: Math.round(pos.coords.longitude * 100) / 100 },
          'your position',
        ),
      () => setGeoError('Your position was not shared. Pick a place from the list or type its coordinates instead.'),
      { maximumAge: 600_000, timeout: 15_000 },
    );
  };

  return (
    <div className="space-y-6">
      <form
        noValidate
        aria-label="Where you watch from"
        className="grid gap-4 sm:grid-cols-[1fr_1fr_auto] sm:items-end"
        onSubmit={form.handleSubmit((v) => setPlace({ ...v, name: formatLatLon(v.latitudeDeg, v.longitudeDeg) }))}
      >
        <div className="space-y-1.5 sm:col-span-3">
          <label htmlFor="sky-place" className="block text-sm font-semibold text-foil-100">
            Pick a place near you
          </label>
          <select
            id="sky-place"
            className={inputClasses}
            defaultValue=""
            onChange={(e) => {
              const p = PLACES.find((x) => x.name === e.target.value);
              if (p) choose(p, p.name);
            }}
          >
            <option value="" disabled>
              Choose a city…
            </option>
            {PLACES.map((p) => (
              <option key={p.name} value={p.name}>
                {p.name} ({formatLatLon(p.latitudeDeg, p.longitudeDeg)})
              </option>
            ))}
          </select>
        </div>
        <TextField
          label="Latitude (°, north positive)"
          inputMode="decimal"
          autoComplete="off"
          {...form.register('latitudeDeg')}
          error={form.formState.errors.latitudeDeg?.message}
        />
        <TextField
          label="Longitude (°, east positive)"
          inputMode="decimal"
          autoComplete="off"
          {...form.register('longitudeDeg')}
          error={form.formState.errors.longitudeDeg?.message}
        />
        <div className="flex flex-wrap gap-2">
          <Button type="submit">Find passes</Button>
          <Button type="button" variant="secondary" onClick={useMyPosition}>
            Use my position
          </Button>
        </div>
        <p className="text-sm text-foil-400 sm:col-span-3">
          Your position is asked for only when you press “Use my position”, is used in this browser to compute the passes, and is never sent
          to us.
        </p>
      </form>
      {geoError && <Alert title="No position">{geoError}</Alert>}

      {place && (
        <section aria-labelledby="passes-heading" className="space-y-3">
          <h2 id="passes-heading" className="text-lg font-bold text-foil-50">
            {passes.length === 0
              ? `No visible pass over ${place.name} in the next ${DAYS} days`
              : `${passes.length} visible ${passes.length === 1 ? 'pass' : 'passes'} over ${place.name} in the next ${DAYS} days`}
          </h2>
          <p className="text-sm text-foil-300">
            Times in your time zone ({zone}). A pass counts when {name} is at least 10° above the horizon, lit by the Sun, while your sky is
            dark (the Sun more than 6° below the horizon).
          </p>
          {passes.length === 0 ? (
            <p className="text-sm text-foil-300">
              From here {name} crosses the sky only in daylight or in the Earth’s shadow for now. Try again in a few days: the times of day
              shift as the orbit turns.
            </p>
          ) : (
            <Table caption={`Visible passes of ${name} over ${place.name}`}>
              <THead>
                <Tr>
                  <Th>Day</Th>
                  <Th>Appears</Th>
                  <Th>Highest</Th>
                  <Th>Disappears</Th>
                  <Th>
                    <span className="sr-only">Calendar</span>
                  </Th>
                </Tr>
              </THead>
              <TBody>
                {passes.map((p) => (
                  <Tr key={p.start.atMs}>
                    <Th scope="row" className="font-semibold text-foil-50">
                      {dayFormat.format(p.start.atMs)}
                    </Th>
                    <Td>
                      {timeFormat.format(p.start.atMs)}
                      <span className="block text-foil-400">{where(p.start)}</span>
                    </Td>
                    <Td>
                      {timeFormat.format(p.highest.atMs)}
                      <span className="block text-foil-400">{where(p.highest)}</span>
                    </Td>
                    <Td>
                      {timeFormat.format(p.end.atMs)}
                      <span className="block text-foil-400">
                        {where(p.end)}
                        {fades(p) ? ', fading into the Earth’s shadow' : ''}
                      </span>
                    </Td>
                    <Td>
                      <Button
                        size="sm"
                        variant="secondary"
                        aria-label={`Add the pass of ${dayFormat.format(p.start.atMs)} at ${timeFormat.format(p.start.atMs)} to your calendar`}
                        onClick={() => {
                          setCalendarError(null);
                          passCalendarFile({ pass: p, craftName: name, placeName: place.name, pageUrl: window.location.href })
                            .then((blob) =>
                              download(blob, `${name.toLowerCase()}-pass-${new Date(p.start.atMs).toISOString().slice(0, 16)}.ics`),
                            )
                            .catch(() => setCalendarError('The calendar file could not be made. Please try again.'));
                        }}
                      >
                        Add to calendar
                      </Button>
                    </Td>
                  </Tr>
                ))}
              </TBody>
            </Table>
          )}
          {calendarError && <Alert title="No calendar file">{calendarError}</Alert>}
          {afterPasses?.(place)}
        </section>
      )}
    </div>
  );
}
