import { useState } from 'react';
import type { CampaignView } from '@shared/schemas/campaign';
import { currencyExponent } from '@shared/money';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { TextField } from '@/components/ui/text-field';
import { errorMessage } from '@/lib/form-errors';
import { useReplaceStretchTargets } from '../api/replace-stretch-targets';
import { minorToMajorText, parseMajor } from '../format';

export function StretchTargetsEditor({ campaign }: { campaign: CampaignView }) {
  const exp = currencyExponent(campaign.currency);
  const [rows, setRows] = useState(
    campaign.stretchTargets.map((t) => ({ amount: minorToMajorText(t.amountMinor, exp), title: t.title, description: t.description })),
  );
  const [bad, setBad] = useState<string | null>(null);
  const save = useReplaceStretchTargets(campaign.slug);
  const update = (i: number, patch: Partial<(typeof rows)[number]>) => setRows(rows.map((r, j) => (j === i ? { ...r, ...patch } : r)));
  const onSave = () => {
    const targets = rows.map((r) => ({ amountMinor: parseMajor(r.amount, exp), title: r.title, description: r.description }));
    const i = targets.findIndex((t) => t.amountMinor === null || t.amountMinor <= 0);
    if (i >= 0) return setBad(`Target ${i + 1}: enter an amount such as 60000`);
    setBad(null);
    save.mutate({ targets: targets.map((t) => ({ ...t, amountMinor: t.amountMinor! })) });
  };
  return (
    <div className="space-y-3">
      {(bad || save.isError) && <Alert title="Not saved">{bad ?? errorMessage(save.error)}</Alert>}
      {save.isSuccess && !bad && <Alert tone="success">Stretch targets saved.</Alert>}
      {rows.map((r, i) => (
        <div key={i} className="grid gap-3 rounded-xl border border-foil-800 p-3 sm:grid-cols-[10rem_1fr_auto] sm:items-end">
          <TextField
            label={`Amount (${campaign.currency})`}
            inputMode="decimal"
            value={r.amount}
            onChange={(e) => update(i, { amount: e.target.value })}
          />
          <TextField label="Title" value={r.title} onChange={(e) => update(i, { title: e.target.value })} />
          <Button variant="ghost" size="sm" onClick={() => setRows(rows.filter((_, j) => j !== i))}>
            Remove
          </Button>
        </div>
      ))}
      <div className="flex flex-wrap gap-2">
        <Button variant="secondary" size="sm" onClick={() => setRows([...rows, { amount: '', title: '', description: '' }])}>
          Add a target
        </Button>
        <Button size="sm" onClick={onSave} loading={save.isPending}>
          Save stretch targets
        </Button>
      </div>
    </div>
  );
}
