import { useId, useState, type FormEvent } from 'react';
import type { CampaignView } from '@shared/schemas/campaign';
import { currencyExponent } from '@shared/money';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { inputClasses, TextField } from '@/components/ui/text-field';
import { isApiError } from '@/lib/api-client';
import { errorMessage } from '@/lib/form-errors';
import { useUpdateCampaign } from '../api/update-campaign';
import { fromLocalInput, minorToMajorText, parseMajor, toLocalInput } from '../format';

export function CampaignDetailsForm({ campaign }: { campaign: CampaignView }) {
  const exp = currencyExponent(campaign.currency);
  const [v, setV] = useState({
    title: campaign.title,
    summary: campaign.summary,
    story: campaign.story,
    goal: minorToMajorText(campaign.goalMinor, exp),
    currency: campaign.currency,
    startsAt: toLocalInput(campaign.startsAt),
    endsAt: toLocalInput(campaign.endsAt),
  });
  const [errors, setErrors] = useState<Record<string, string>>({});
  const update = useUpdateCampaign(campaign.slug);
  const storyId = useId();
  const set = (k: keyof typeof v) => (e: { target: { value: string } }) => setV({ ...v, [k]: e.target.value });

  const onSubmit = (event: FormEvent) => {
    event.preventDefault();
    const goalMinor = parseMajor(v.goal, exp);
    if (goalMinor === null) return setErrors({ goalMinor: 'Enter the goal as a number such as 48000 or 48000.50' });
    setErrors({});
    update.mutate(
      {
        title: v.title,
        summary: v.summary,
        story: v.story,
        goalMinor,
        currency: v.currency,
        startsAt: fromLocalInput(v.startsAt, campaign.startsAt),
        endsAt: fromLocalInput(v.endsAt, campaign.endsAt),
      },
      { onError: (err) => isApiError(err) && setErrors(Object.fromEntries(err.details.map((d) => [d.path, d.message]))) },
    );
  };

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4">
      {update.isError && <Alert title="Not saved">{errorMessage(update.error)}</Alert>}
      {update.isSuccess && <Alert tone="success">Campaign saved.</Alert>}
      <TextField label="Title" value={v.title} onChange={set('title')} error={errors.title} />
      <TextField label="Summary" hint="One sentence under the title." value={v.summary} onChange={set('summary')} error={errors.summary} />
      <div className="space-y-1.5">
        <label htmlFor={storyId} className="block text-sm font-semibold text-foil-100">
          Story <span className="font-normal text-foil-400">(blank lines start a new paragraph)</span>
        </label>
        <textarea id={storyId} rows={8} className={inputClasses} value={v.story} onChange={set('story')} />
      </div>
      <div className="grid gap-4 sm:grid-cols-2">
        <TextField label={`Goal (${v.currency})`} inputMode="decimal" value={v.goal} onChange={set('goal')} error={errors.goalMinor} />
        <TextField
          label="Currency"
          hint="Locked once anyone has pledged."
          maxLength={3}
          value={v.currency}
          onChange={(e) => setV({ ...v, currency: e.target.value.toUpperCase() })}
          error={errors.currency}
        />
        <TextField label="Opens (UTC)" type="datetime-local" value={v.startsAt} onChange={set('startsAt')} error={errors.startsAt} />
        <TextField label="Closes (UTC)" type="datetime-local" value={v.endsAt} onChange={set('endsAt')} error={errors.endsAt} />
      </div>
      <Button type="submit" loading={update.isPending}>
        Save campaign
      </Button>
    </form>
  );
}
