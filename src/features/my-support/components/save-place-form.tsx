import { useState } from 'react';
import { Link } from 'react-router-dom';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { savePlaceSchema } from '@shared/schemas/places';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { TextField } from '@/components/ui/text-field';
import { applyApiError } from '@/lib/form-errors';
import { useSavePlace } from '../api/save-place';

type In = z.input<typeof savePlaceSchema>;
type Out = z.output<typeof savePlaceSchema>;

/**
 * Under the sky-watch forecast: keep this place in my support (only when the backer asks; sky watch itself sends
 * nothing to us). Signed-out visitors are told what signing in would give them.
 */
export function SavePlaceForm({
  place,
  signedIn,
  returnTo,
}: {
  place: { name: string; latitudeDeg: number; longitudeDeg: number };
  signedIn: boolean;
  returnTo: string;
}) {
  const save = useSavePlace();
  const [topError, setTopError] = useState<string | null>(null);
  const suggested = /^-?\d/.test(place.name) || place.name === 'your position' ? '' : place.name;
  const form = useForm<In, unknown, Out>({
    resolver: zodResolver(savePlaceSchema),
    values: {
      name: suggested,
      latitudeDeg: place.latitudeDeg,
      longitudeDeg: place.longitudeDeg,
      timeZone: Intl.DateTimeFormat().resolvedOptions().timeZone || 'UTC',
    },
  });

  if (!signedIn) {
    return (
      <p className="text-sm text-foil-300">
        <Link
          className="font-semibold text-amber-300 underline underline-offset-4"
          to={`/sign-in?returnTo=${encodeURIComponent(returnTo)}`}
        >
          Sign in
        </Link>{' '}
        to save this place and get an e-mail before a good pass over it.
      </p>
    );
  }
  if (save.isSuccess) {
    return (
      <Alert tone="success" title={`Saved “${save.data.name}”`}>
        Find it, and turn pass reminders on or off, in{' '}
        <Link className="underline underline-offset-4" to="/my-support/places">
          My support → Saved places
        </Link>
        .
      </Alert>
    );
  }
  return (
    <form
      noValidate
      aria-label="Save this place"
      className="grid gap-3 rounded-xl border border-foil-700 p-4 sm:grid-cols-[1fr_auto] sm:items-end"
      onSubmit={form.handleSubmit((values) => {
        setTopError(null);
        save.mutate(values, {
          onError: (err) => setTopError(applyApiError(err, form.setError, { fields: ['name', 'latitudeDeg', 'longitudeDeg', 'timeZone'] })),
        });
      })}
    >
      <TextField
        label="Save this place as"
        hint={`Kept in My support with its coordinates and your time zone (${form.getValues('timeZone')}), nothing else.`}
        autoComplete="off"
        maxLength={60}
        {...form.register('name')}
        error={form.formState.errors.name?.message}
      />
      <Button type="submit" variant="secondary" loading={save.isPending}>
        Save place
      </Button>
      {(topError || form.formState.errors.latitudeDeg || form.formState.errors.longitudeDeg) && (
        <Alert className="sm:col-span-2" title="Not saved">
          {topError ?? form.formState.errors.latitudeDeg?.message ?? form.formState.errors.longitudeDeg?.message}
        </Alert>
      )}
    </form>
  );
}
