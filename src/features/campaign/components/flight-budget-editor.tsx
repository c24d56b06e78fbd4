import { useId, useRef, useState, type KeyboardEvent } from 'react';
import type { CampaignView } from '@shared/schemas/campaign';
import { budgetLinesSchema } from '@shared/schemas/budget-lines';
import { budgetTotalMinor } from '@shared/flight-budget';
import { currencyExponent } from '@shared/money';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { TextField } from '@/components/ui/text-field';
import { fieldOf } from '@/lib/form-errors';
import { isApiError } from '@/lib/api-client';
import { useReplaceBudgetLines } from '../api/replace-budget-lines';
import { minorToMajorText, money, parseMajor } from '../format';

type Row = { key: string; name: string; amount: string; reason: string };
type RowErrors = Partial<Record<'name' | 'amount' | 'reason', string>>;

let nextKey = 0;
const newKey = () => `line-${++nextKey}`;

/**
 * The campaign desk's flight budget: lines in the order money fills them, amounts typed in the campaign's
 * currency and sent in minor units, the goal shown as their sum. Reorder with the Move buttons or Alt+↑/↓.
 */
export function FlightBudgetEditor({ campaign }: { campaign: CampaignView }) {
  const exp = currencyExponent(campaign.currency);
  const [rows, setRows] = useState<Row[]>(() =>
    campaign.budgetLines.map((l) => ({ key: newKey(), name: l.name, amount: minorToMajorText(l.amountMinor, exp), reason: l.reason })),
  );
  const [errors, setErrors] = useState<Record<string, RowErrors>>({});
  const [topError, setTopError] = useState<string | null>(null);
  const [announce, setAnnounce] = useState('');
  const save = useReplaceBudgetLines(campaign.slug);
  const rowRefs = useRef(new Map<string, HTMLDivElement>());
  const headingId = useId();

  const amounts = rows.map((r) => parseMajor(r.amount, exp));
  const totalMinor = budgetTotalMinor(amounts.map((a) => ({ amountMinor: a ?? 0 })));
  const unreadable = amounts.filter((a) => a === null).length;

  const update = (key: string, patch: Partial<Row>) => {
    setRows((rs) => rs.map((r) => (r.key === key ? { ...r, ...patch } : r)));
    save.reset();
  };
  const move = (index: number, by: -1 | 1, focus: 'up' | 'down' | 'row') => {
    const to = index + by;
    if (to < 0 || to >= rows.length) return;
    const next = [...rows];
    const [row] = next.splice(index, 1);
    next.splice(to, 0, row!);
    setRows(next);
    save.reset();
    setAnnounce(`${row!.name || 'Unnamed line'} moved to position ${to + 1} of ${next.length}.`);
    // Keep the keyboard on the moved line (its own Move button, or the line if that button is now disabled).
    requestAnimationFrame(() => {
      const el = rowRefs.current.get(row!.key);
      const wanted = focus === 'row' ? null : el?.querySelector<HTMLButtonElement>(`[data-move="${focus}"]:not(:disabled)`);
      (wanted ?? el)?.focus();
    });
  };
  const remove = (index: number) => {
    const row = rows[index]!;
    setRows(rows.filter((_, i) => i !== index));
    save.reset();
    setAnnounce(`${row.name || 'Unnamed line'} removed.`);
  };
  const onRowKey = (index: number) => (e: KeyboardEvent<HTMLDivElement>) => {
    if (!e.altKey || (e.key !== 'ArrowUp' && e.key !== 'ArrowDown')) return;
    e.preventDefault();
    move(index, e.key === 'ArrowUp' ? -1 : 1, 'row');
  };

  const onSave = () => {
    setTopError(null);
    const found: Record<string, RowErrors> = {};
    rows.forEach((r, i) => {
      if (amounts[i] === null)
        (found[r.key] ??= {}).amount = r.amount.trim()
          ? `Type the amount in ${campaign.currency}, e.g. 12000 or 12000.50.`
          : 'Give the amount this line costs.';
    });
    const input = { lines: rows.map((r, i) => ({ name: r.name, amountMinor: amounts[i] ?? 0, reason: r.reason })) };
    const parsed = budgetLinesSchema.safeParse(input);
    if (!parsed.success) {
      for (const issue of parsed.error.issues) {
        const [, i, field] = issue.path as [string, number | undefined, string | undefined];
        if (i === undefined || !field) {
          setTopError(issue.message);
          continue;
        }
        const key = rows[i]!.key;
        const name = field === 'amountMinor' ? 'amount' : (field as keyof RowErrors);
        if (name === 'amount' && found[key]?.amount) continue;
        (found[key] ??= {})[name] ??= issue.message;
      }
    }
    setErrors(found);
    if (Object.keys(found).length > 0 || !parsed.success) {
      const firstKey = rows.find((r) => found[r.key])?.key;
      if (firstKey)
        requestAnimationFrame(() => rowRefs.current.get(firstKey)?.querySelector<HTMLElement>('[aria-invalid="true"]')?.focus());
      return;
    }
    save.mutate(parsed.data, {
      onError: (err) => {
        if (!isApiError(err) || err.details.length === 0)
          return setTopError(isApiError(err) ? err.message : 'Not saved. Please try again.');
        const server: Record<string, RowErrors> = {};
        const left: string[] = [];
        for (const d of err.details) {
          const [, i, field] = fieldOf(d.path).split('.');
          const row = i === undefined ? undefined : rows[Number(i)];
          if (!row || !field) left.push(d.message);
          else (server[row.key] ??= {})[field === 'amountMinor' ? 'amount' : (field as keyof RowErrors)] = d.message;
        }
        setErrors(server);
        setTopError(left.length ? left.join(' ') : 'Not saved: see the marked lines.');
      },
    });
  };

  return (
    <section aria-labelledby={headingId} className="space-y-4">
      <h3 id={headingId} className="sr-only">
        Flight budget lines
      </h3>
      <p aria-live="polite" className="sr-only">
        {announce}
      </p>
      {topError && <Alert title="Not saved">{topError}</Alert>}
      {save.isSuccess && (
        <Alert tone="success">Flight budget saved. The goal is now {money(save.data.goalMinor, campaign.currency)}.</Alert>
      )}
      {rows.length === 0 ? (
        <p className="text-sm text-foil-300">No budget lines: the campaign page shows the goal without a flight budget.</p>
      ) : (
        <ol className="space-y-3">
          {rows.map((r, i) => {
            const e = errors[r.key] ?? {};
            const amountMinor = amounts[i];
            return (
              <li key={r.key}>
                <div
                  ref={(el) => {
                    if (el) rowRefs.current.set(r.key, el);
                    else rowRefs.current.delete(r.key);
                  }}
                  tabIndex={-1}
                  role="group"
                  aria-label={`Line ${i + 1}: ${r.name || 'unnamed'}`}
                  onKeyDown={onRowKey(i)}
                  data-testid="budget-line-editor"
                  className="grid gap-3 rounded-xl border border-foil-800 p-3 focus:outline-2 focus:outline-amber-300 sm:grid-cols-[2.5rem_1fr_11rem] sm:items-start"
                >
                  <span aria-hidden="true" className="text-lg font-bold text-foil-400 tabular-nums sm:pt-8">
                    {i + 1}.
                  </span>
                  <TextField
                    label="Name"
                    value={r.name}
                    maxLength={80}
                    error={e.name}
                    onChange={(ev) => update(r.key, { name: ev.target.value })}
                  />
                  <TextField
                    label={`Amount (${campaign.currency})`}
                    inputMode="decimal"
                    value={r.amount}
                    error={e.amount}
                    hint={amountMinor !== null && amountMinor !== undefined ? money(amountMinor, campaign.currency) : undefined}
                    onChange={(ev) => update(r.key, { amount: ev.target.value })}
                  />
                  <TextField
                    className="sm:col-start-2 sm:col-end-4"
                    label="Why it is needed (optional)"
                    value={r.reason}
                    maxLength={300}
                    error={e.reason}
                    onChange={(ev) => update(r.key, { reason: ev.target.value })}
                  />
                  <div className="flex flex-wrap gap-2 sm:col-start-2 sm:col-end-4">
                    <Button size="sm" variant="ghost" data-move="up" disabled={i === 0} onClick={() => move(i, -1, 'up')}>
                      Move up<span className="sr-only"> {r.name}</span>
                    </Button>
                    <Button size="sm" variant="ghost" data-move="down" disabled={i === rows.length - 1} onClick={() => move(i, 1, 'down')}>
                      Move down<span className="sr-only"> {r.name}</span>
                    </Button>
                    <Button size="sm" variant="danger" onClick={() => remove(i)}>
                      Remove<span className="sr-only"> {r.name}</span>
                    </Button>
                  </div>
                </div>
              </li>
            );
          })}
        </ol>
      )}
      <div className="flex flex-wrap items-center justify-between gap-3 rounded-xl bg-night-800/60 px-4 py-3">
        <p className="text-foil-100" data-testid="budget-goal">
          Goal (sum of the lines): <strong className="tabular-nums">{money(totalMinor, campaign.currency)}</strong>
          {unreadable > 0 && (
            <span className="ml-2 text-sm text-amber-200">
              ({unreadable} amount{unreadable === 1 ? '' : 's'} not counted yet)
            </span>
          )}
        </p>
        <p className="text-sm text-foil-400">Reorder: Move buttons, or Alt+↑ / Alt+↓ on a line.</p>
      </div>
      <div className="flex flex-wrap gap-2">
        <Button
          variant="secondary"
          size="sm"
          disabled={rows.length >= 20}
          onClick={() => {
            const key = newKey();
            setRows([...rows, { key, name: '', amount: '', reason: '' }]);
            save.reset();
            requestAnimationFrame(() => rowRefs.current.get(key)?.querySelector('input')?.focus());
          }}
        >
          Add a budget line
        </Button>
        <Button size="sm" onClick={onSave} loading={save.isPending}>
          Save flight budget
        </Button>
      </div>
    </section>
  );
}
