import { useState, type FormEvent } from 'react';
import type { EmailPreferences } from '@shared/schemas/campaign';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { errorMessage } from '@/lib/form-errors';
import { useUpdateEmailPreferences } from '../api/email-preferences';

const choices: { key: keyof EmailPreferences; label: string; hint: string }[] = [
  { key: 'dispatches', label: 'Dispatches', hint: 'Mission updates from the team, as they are published.' },
  { key: 'receipts', label: 'Pledge confirmations', hint: 'A message when a pledge is paid, with a link to its receipt.' },
  { key: 'membership', label: 'Crew membership notices', hint: 'When a monthly renewal fails and your card needs updating.' },
];

export function EmailPreferencesForm({ initial }: { initial: EmailPreferences }) {
  const [prefs, setPrefs] = useState(initial);
  const update = useUpdateEmailPreferences();
  const dirty = choices.some((c) => prefs[c.key] !== initial[c.key]);
  const onSubmit = (event: FormEvent) => {
    event.preventDefault();
    update.mutate(prefs);
  };
  return (
    <form onSubmit={onSubmit} className="space-y-4">
      {update.isError && <Alert title="Could not save">{errorMessage(update.error)}</Alert>}
      {update.isSuccess && !dirty && <Alert tone="success">Your e-mail choices are saved.</Alert>}
      <fieldset className="space-y-3">
        <legend className="sr-only">E-mails you want from Lightkeel</legend>
        {choices.map((c) => (
          <label
            key={c.key}
            className="flex cursor-pointer items-start gap-3 rounded-xl border border-foil-700 px-4 py-3 hover:border-foil-500"
          >
            <input
              type="checkbox"
              className="mt-1 size-4 accent-amber-400"
              checked={prefs[c.key]}
              onChange={(e) => setPrefs({ ...prefs, [c.key]: e.target.checked })}
            />
            <span>
              <span className="block font-semibold text-foil-50">{c.label}</span>
              <span className="block text-sm text-foil-400">{c.hint}</span>
            </span>
          </label>
        ))}
      </fieldset>
      <Button type="submit" loading={update.isPending} disabled={!dirty && !update.isError}>
        Save e-mail choices
      </Button>
    </form>
  );
}
