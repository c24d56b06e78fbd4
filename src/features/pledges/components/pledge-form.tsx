import { useId, useState, type FormEvent } from 'react';
import { NO_GIFT_LABEL } from '@shared/schemas/campaign';
import type { AccountView } from '@shared/schemas/auth';
import { PLEDGE_MAX_MINOR, PLEDGE_MIN_MINOR, type CampaignView } from '@shared/schemas/campaign';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { inputClasses, TextField } from '@/components/ui/text-field';
import { isApiError } from '@/lib/api-client';
import { cn } from '@/lib/cn';
import { useCreatePledge } from '../api/create-pledge';
import { minorToInput, money, parseAmountToMinor } from '../amount';

type Errors = Partial<Record<'amount' | 'publicName' | 'message' | 'form', string>>;

/**
 * Tier or custom amount, name or anonymous, a message. On submit the server opens a checkout at the
 * processor and we go there; the card is typed on the processor's page, never here.
 */
export function PledgeForm({
  campaign,
  account,
  initialTierId,
  onCheckout,
}: {
  campaign: CampaignView;
  account: AccountView;
  initialTierId: string | null;
  onCheckout: (url: string) => void;
}) {
  const available = campaign.tiers.filter((t) => !t.soldOut);
  const initial = available.find((t) => t.id === initialTierId) ?? null;
  const [tierId, setTierId] = useState<string | null>(initial?.id ?? null);
  const tier = available.find((t) => t.id === tierId) ?? null;
  const [amount, setAmount] = useState(minorToInput(initial?.minAmountMinor ?? 5000, campaign.currency));
  const [anonymous, setAnonymous] = useState(false);
  const [publicName, setPublicName] = useState(account.displayName);
  const [message, setMessage] = useState('');
  const [errors, setErrors] = useState<Errors>({});
  // One key per attempt: a double submit or a retry after a lost answer reuses it; a refused attempt gets a new one.
  const [attemptKey, setAttemptKey] = useState(() => crypto.randomUUID());
  const create = useCreatePledge();
  const messageId = useId();
  const minMinor = tier?.minAmountMinor ?? PLEDGE_MIN_MINOR;

  const choose = (id: string | null) => {
    setTierId(id);
    const next = available.find((t) => t.id === id);
    if (next) setAmount(minorToInput(next.minAmountMinor, campaign.currency));
    setErrors({});
  };

  const onSubmit = async (event: FormEvent) => {
    event.preventDefault();
    const next: Errors = {};
    const parsed = parseAmountToMinor(amount, campaign.currency);
    if ('error' in parsed) next.amount = parsed.error;
    else if (parsed.minor < minMinor)
      next.amount = `The smallest amount${tier ? ` for ${tier.title}` : ''} is ${money(minMinor, campaign.currency)}`;
    else if (parsed.minor > PLEDGE_MAX_MINOR)
      next.amount = `The largest pledge we take here is ${money(PLEDGE_MAX_MINOR, campaign.currency)}`;
    if (!anonymous && publicName.trim().length > 60) next.publicName = 'Keep the public name to 60 characters';
    if (message.trim().length > 500) next.message = 'Keep the message to 500 characters';
    setErrors(next);
    if (Object.keys(next).length > 0 || 'error' in parsed) return;
    try {
      const res = await create.mutateAsync({
        campaignSlug: campaign.slug,
        tierId,
        amountMinor: parsed.minor,
        anonymous,
        publicName: anonymous ? undefined : publicName.trim() || undefined,
        message: message.trim() || undefined,
        attemptKey,
      });
      onCheckout(res.checkoutUrl);
    } catch (error) {
      if (isApiError(error) && error.status >= 400 && error.status < 500) setAttemptKey(crypto.randomUUID());
      const fieldErrors: Errors = {};
      if (isApiError(error)) {
        for (const d of error.details) {
          if (d.path === 'amountMinor') fieldErrors.amount = d.message;
          if (d.path === 'publicName') fieldErrors.publicName = d.message;
          if (d.path === 'message') fieldErrors.message = d.message;
        }
        if (error.code === 'pledges.tier_sold_out') fieldErrors.form = `${error.message} Choose another tier.`;
      }
      setErrors({
        ...fieldErrors,
        form: fieldErrors.form ?? (isApiError(error) ? error.message : 'Something went wrong. Please try again.'),
      });
    }
  };

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-6">
      {errors.form && <Alert title="The pledge did not start">{errors.form}</Alert>}
      <fieldset className="space-y-2">
        <legend className="mb-2 text-sm font-semibold text-foil-100">What would you like to back?</legend>
        {[
          ...available.map((t) => ({
            id: t.id,
            title: t.title,
            note:
              t.kind === 'monthly'
                ? `${money(t.minAmountMinor, campaign.currency)} a month`
                : `from ${money(t.minAmountMinor, campaign.currency)}`,
            detail: t.remaining !== null ? `${t.remaining} left` : null,
          })),
          { id: null, title: NO_GIFT_LABEL, note: `any amount from ${money(PLEDGE_MIN_MINOR, campaign.currency)}`, detail: null },
        ].map((option) => {
          const checked = option.id === tierId;
          return (
            <label
              key={option.id ?? 'custom'}
              className={cn(
                'flex cursor-pointer items-start gap-3 rounded-xl border px-4 py-3',
                checked ? 'border-amber-400 bg-night-800' : 'border-foil-700 hover:border-foil-500',
              )}
            >
              <input type="radio" name="tier" className="mt-1 accent-amber-400" checked={checked} onChange={() => choose(option.id)} />
              <span className="min-w-0 flex-1">
                <span className="block font-semibold text-foil-50">{option.title}</span>
                <span className="block text-sm text-foil-400">
                  {option.note}
                  {option.detail && ` · ${option.detail}`}
                </span>
              </span>
            </label>
          );
        })}
      </fieldset>

      <TextField
        label={tier?.kind === 'monthly' ? `Monthly amount (${campaign.currency})` : `Amount (${campaign.currency})`}
        inputMode="decimal"
        autoComplete="off"
        name="amount"
        value={amount}
        onChange={(e) => setAmount(e.target.value)}
        hint={`At least ${money(minMinor, campaign.currency)}.${tier?.kind === 'monthly' ? ' Charged today and then once a month until you stop it.' : ''}`}
        error={errors.amount}
      />

      <fieldset className="space-y-3">
        <legend className="mb-1 text-sm font-semibold text-foil-100">On the list of backers</legend>
        <div className="flex flex-wrap gap-4 text-sm text-foil-100">
          <label className="inline-flex items-center gap-2">
            <input type="radio" name="visibility" className="accent-amber-400" checked={!anonymous} onChange={() => setAnonymous(false)} />
            Show my name
          </label>
          <label className="inline-flex items-center gap-2">
            <input type="radio" name="visibility" className="accent-amber-400" checked={anonymous} onChange={() => setAnonymous(true)} />
            Stay anonymous
          </label>
        </div>
        {!anonymous && (
          <TextField
            label="Public name"
            name="publicName"
            maxLength={60}
            value={publicName}
            onChange={(e) => setPublicName(e.target.value)}
            error={errors.publicName}
          />
        )}
      </fieldset>

      <div className="space-y-1.5">
        <label htmlFor={messageId} className="block text-sm font-semibold text-foil-100">
          A message for the team <span className="font-normal text-foil-400">(optional, shown with your name)</span>
        </label>
        <textarea
          id={messageId}
          name="message"
          rows={3}
          maxLength={500}
          className={inputClasses}
          value={message}
          onChange={(e) => setMessage(e.target.value)}
          aria-invalid={errors.message ? true : undefined}
        />
        {errors.message && <p className="text-sm font-semibold text-red-300">{errors.message}</p>}
      </div>

      <div className="space-y-2">
        <Button type="submit" size="lg" loading={create.isPending} className="w-full sm:w-auto">
          Continue to payment
        </Button>
        <p className="text-sm text-foil-400">You type your card on the payment processor’s page; Lightkeel never sees the number.</p>
      </div>
    </form>
  );
}
