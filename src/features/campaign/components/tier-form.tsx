import { useState, type FormEvent } from 'react';
import type { TierInput, TierView } from '@shared/schemas/campaign';
import { currencyExponent } from '@shared/money';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { inputClasses, TextField } from '@/components/ui/text-field';
import { isApiError } from '@/lib/api-client';
import { errorMessage } from '@/lib/form-errors';
import { useSaveTier } from '../api/save-tier';
import { minorToMajorText, parseMajor } from '../format';

export function TierForm({ slug, currency, tier, onDone }: { slug: string; currency: string; tier?: TierView; onDone: () => void }) {
  const exp = currencyExponent(currency);
  const [v, setV] = useState({
    title: tier?.title ?? '',
    description: tier?.description ?? '',
    amount: tier ? minorToMajorText(tier.minAmountMinor, exp) : '',
    kind: tier?.kind ?? 'one-time',
    limit: tier?.quantityLimit?.toString() ?? '',
    delivery: tier?.estimatedDelivery ?? '',
    position: String(tier?.position ?? 0),
    active: tier?.active ?? true,
  });
  const [errors, setErrors] = useState<Record<string, string>>({});
  const save = useSaveTier(slug);

  const onSubmit = (event: FormEvent) => {
    event.preventDefault();
    const minAmountMinor = parseMajor(v.amount, exp);
    const limit = v.limit.trim() === '' ? null : Number(v.limit);
    const next: Record<string, string> = {};
    if (minAmountMinor === null) next.minAmountMinor = 'Enter an amount such as 35 or 35.50';
    if (limit !== null && (!Number.isInteger(limit) || limit < 1))
      next.quantityLimit = 'Leave empty for no limit, or a whole number of at least 1';
    setErrors(next);
    if (Object.keys(next).length > 0 || minAmountMinor === null) return;
    save.mutate(
      {
        tierId: tier?.id,
        input: {
          title: v.title,
          description: v.description,
          minAmountMinor,
          kind: v.kind,
          quantityLimit: limit,
          estimatedDelivery: v.delivery || null,
          position: Number(v.position) || 0,
          active: v.active,
        },
      },
      {
        onSuccess: onDone,
        onError: (err) => isApiError(err) && setErrors(Object.fromEntries(err.details.map((d) => [d.path, d.message]))),
      },
    );
  };

  return (
    <form
      onSubmit={onSubmit}
      noValidate
      aria-label={tier ? `Edit tier ${tier.title}` : 'New tier'}
      className="space-y-3 rounded-xl border border-foil-700 p-4"
    >
      {save.isError && <Alert title="Tier not saved">{errorMessage(save.error)}</Alert>}
      <div className="grid gap-3 sm:grid-cols-2">
        <TextField label="Title" value={v.title} onChange={(e) => setV({ ...v, title: e.target.value })} error={errors.title} />
        <TextField
          label={`Minimum amount (${currency})`}
          inputMode="decimal"
          value={v.amount}
          onChange={(e) => setV({ ...v, amount: e.target.value })}
          error={errors.minAmountMinor}
        />
        <div className="space-y-1.5">
          <label className="block text-sm font-semibold text-foil-100" htmlFor={`kind-${tier?.id ?? 'new'}`}>
            Kind
          </label>
          <select
            id={`kind-${tier?.id ?? 'new'}`}
            className={inputClasses}
            value={v.kind}
            onChange={(e) => setV({ ...v, kind: e.target.value as TierInput['kind'] })}
          >
            <option value="one-time">One-time</option>
            <option value="monthly">Monthly (crew membership)</option>
          </select>
        </div>
        <TextField
          label="Limit"
          hint="Empty = unlimited"
          inputMode="numeric"
          value={v.limit}
          onChange={(e) => setV({ ...v, limit: e.target.value })}
          error={errors.quantityLimit}
        />
        <TextField
          label="Gift ships around"
          type="date"
          value={v.delivery}
          onChange={(e) => setV({ ...v, delivery: e.target.value })}
          error={errors.estimatedDelivery}
        />
        <TextField label="Position" inputMode="numeric" value={v.position} onChange={(e) => setV({ ...v, position: e.target.value })} />
      </div>
      <TextField
        label="Description"
        value={v.description}
        onChange={(e) => setV({ ...v, description: e.target.value })}
        error={errors.description}
      />
      <label className="inline-flex items-center gap-2 text-sm text-foil-100">
        <input type="checkbox" className="accent-amber-400" checked={v.active} onChange={(e) => setV({ ...v, active: e.target.checked })} />
        Shown on the campaign page
      </label>
      <div className="flex gap-2">
        <Button type="submit" size="sm" loading={save.isPending}>
          {tier ? 'Save tier' : 'Add tier'}
        </Button>
        <Button variant="ghost" size="sm" onClick={onDone}>
          Cancel
        </Button>
      </div>
    </form>
  );
}
