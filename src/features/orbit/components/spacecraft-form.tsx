import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { spacecraftInputSchema } from '@shared/schemas/orbit';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { TextField } from '@/components/ui/text-field';
import { applyApiError } from '@/lib/form-errors';
import { useState } from 'react';
import { useSaveSpacecraft } from '../api/save-spacecraft';
import { DATE_HINT, DATE_TIME_HINT, fromDateTimeInput, toDateTimeInput } from '../format';
import type { Spacecraft } from '../types';

type In = z.input<typeof spacecraftInputSchema>;
type Out = z.output<typeof spacecraftInputSchema>;
const fields = [
  'name',
  'slug',
  'catalogNumber',
  'internationalDesignator',
  'massKg',
  'sailAreaM2',
  'sailReflectivity',
  'dragCoefficient',
  'dragAreaEdgeOnM2',
  'launchDate',
  'sailDeployedAt',
  'isMissionCraft',
] as const;

/** Values to start a new record from, e.g. what an uploaded file says about another object. */
export type SpacecraftPrefill = Partial<
  Record<
    'name' | 'slug' | 'catalogNumber' | 'internationalDesignator' | 'massKg' | 'sailAreaM2' | 'dragCoefficient' | 'dragAreaEdgeOnM2',
    string
  >
>;

export function SpacecraftForm({
  craft,
  prefill,
  onSaved,
}: {
  craft: Spacecraft | null;
  prefill?: SpacecraftPrefill;
  onSaved?: (c: Spacecraft) => void;
}) {
  const save = useSaveSpacecraft();
  const [formError, setFormError] = useState<string | null>(null);
  const form = useForm<In, unknown, Out>({
    resolver: zodResolver(spacecraftInputSchema),
    defaultValues: craft
      ? {
          ...craft,
          launchDate: craft.launchDate ?? '',
          sailDeployedAt: craft.sailDeployedAt ? toDateTimeInput(craft.sailDeployedAt) : '',
        }
      : {
          name: '',
          slug: '',
          catalogNumber: '',
          internationalDesignator: '',
          massKg: '',
          sailAreaM2: '',
          sailReflectivity: 0.9,
          dragCoefficient: 2.2,
          dragAreaEdgeOnM2: '',
          launchDate: '',
          sailDeployedAt: '',
          isMissionCraft: false,
          ...prefill,
        },
  });
  const err = (k: (typeof fields)[number]) => form.formState.errors[k]?.message;
  return (
    <form
      noValidate
      className="grid gap-4 sm:grid-cols-2"
      onSubmit={form.handleSubmit((values) => {
        setFormError(null);
        const body = {
          ...values,
          sailDeployedAt: values.sailDeployedAt ? (fromDateTimeInput(values.sailDeployedAt) ?? values.sailDeployedAt) : '',
        };
        save.mutate(
          { id: craft?.id, values: body },
          {
            onSuccess: ({ spacecraft }) => onSaved?.(spacecraft),
            onError: (e) => setFormError(applyApiError(e, form.setError, { fields })),
          },
        );
      }, undefined)}
    >
      <TextField label="Name" {...form.register('name')} error={err('name')} />
      <TextField label="Handle (for public links)" hint="e.g. tern-1" {...form.register('slug')} error={err('slug')} />
      <TextField label="Catalog number" {...form.register('catalogNumber')} error={err('catalogNumber')} />
      <TextField
        label="International designator"
        hint="e.g. 25951C"
        {...form.register('internationalDesignator')}
        error={err('internationalDesignator')}
      />
      <TextField label="Mass (kg)" inputMode="decimal" {...form.register('massKg')} error={err('massKg')} />
      <TextField
        label="Sail area (m²)"
        hint="0 or empty for a comparison object without a sail"
        inputMode="decimal"
        {...form.register('sailAreaM2')}
        error={err('sailAreaM2')}
      />
      <TextField
        label="Sail reflectivity (0–1)"
        inputMode="decimal"
        {...form.register('sailReflectivity')}
        error={err('sailReflectivity')}
      />
      <TextField label="Drag coefficient" inputMode="decimal" {...form.register('dragCoefficient')} error={err('dragCoefficient')} />
      <TextField
        label="Drag area edge-on (m²)"
        inputMode="decimal"
        {...form.register('dragAreaEdgeOnM2')}
        error={err('dragAreaEdgeOnM2')}
      />
      <TextField label="Launch date" hint={DATE_HINT} placeholder="2025-10-08" {...form.register('launchDate')} error={err('launchDate')} />
      <TextField
        label="Sail deployed"
        hint={DATE_TIME_HINT}
        placeholder="2025-11-01 00:00"
        {...form.register('sailDeployedAt')}
        error={err('sailDeployedAt')}
      />
      <label className="flex items-start gap-2 text-sm text-foil-200 sm:col-span-2">
        <input type="checkbox" className="mt-0.5 size-4 accent-amber-400" {...form.register('isMissionCraft')} />
        <span>
          <span className="font-semibold text-foil-100">The mission craft</span>
          <span className="block text-foil-400">
            The desk, the public pages and new snapshots open on it. Marking this craft unmarks the one marked before.
          </span>
        </span>
      </label>
      <div className="flex items-end sm:col-span-2">
        <Button type="submit" loading={save.isPending}>
          {craft ? 'Save record' : 'Add spacecraft'}
        </Button>
      </div>
      {formError && (
        <Alert className="sm:col-span-2" title="Not saved">
          {formError}
        </Alert>
      )}
      {save.isSuccess && !formError && <Alert tone="success" className="sm:col-span-2" title="Saved" />}
    </form>
  );
}
