import { useState, type FormEvent } from 'react';
import { refundReasons, refundReasonWords, type RefundReason } from '@shared/schemas/books';
import { Alert } from '@/components/ui/alert';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { ConfirmDialog } from '@/components/ui/confirm-dialog';
import { Spinner } from '@/components/ui/spinner';
import { Table, TBody, THead, Td, Th, Tr } from '@/components/ui/table';
import { TextField } from '@/components/ui/text-field';
import { useToast } from '@/components/ui/toast';
import { errorMessage, fieldErrors } from '@/lib/form-errors';
import { money } from '@/lib/money';
import { pledgeStateLabels } from '@/lib/pledge-state';
import { usePledge, type BooksPledge } from '../api/get-pledge';
import { useCreateRefund } from '../api/create-refund';

const refundStateWords: Record<BooksPledge['refunds'][number]['state'], string> = {
  pending: 'waiting for the processor',
  booked: 'in the ledger',
  failed: 'refused by the processor',
};
const dateTime = (iso: string) =>
  new Date(iso).toLocaleString('en-GB', { dateStyle: 'medium', timeStyle: 'short', timeZone: 'UTC' }) + ' UTC';

/** "12.50" → 1250; null when it is not an amount with at most two decimals. */
function toMinor(text: string): number | null {
  const m = /^\s*(\d+)(?:[.,](\d{1,2}))?\s*$/.exec(text);
  if (!m) return null;
  return Number(m[1]) * 100 + Number((m[2] ?? '0').padEnd(2, '0'));
}

function RefundForm({ pledge, charge }: { pledge: BooksPledge; charge: BooksPledge['charges'][number] }) {
  const refund = useCreateRefund();
  const notify = useToast();
  const [amount, setAmount] = useState(() => (charge.refundableMinor / 100).toFixed(2));
  const [reason, setReason] = useState<RefundReason>('backer_asked');
  const [note, setNote] = useState('');
  const [localError, setLocalError] = useState<string | null>(null);
  const [asking, setAsking] = useState<number | null>(null);
  const serverErrors = refund.isError ? fieldErrors(refund.error) : {};
  const submit = (e: FormEvent) => {
    e.preventDefault();
    const minor = toMinor(amount);
    if (minor === null || minor <= 0) return setLocalError('Write an amount such as 12.50.');
    if (minor > charge.refundableMinor)
      return setLocalError(`At most ${money(charge.refundableMinor, charge.currency)} is left to refund on this payment.`);
    setLocalError(null);
    setAsking(minor);
  };
  const who = pledge.pledge.backer?.email ?? 'the backer';
  return (
    <form className="mt-4 space-y-3" onSubmit={submit} noValidate>
      <div className="flex flex-wrap items-end gap-3">
        <TextField
          label={`Amount in ${charge.currency}`}
          hint={`Up to ${money(charge.refundableMinor, charge.currency)}`}
          inputMode="decimal"
          value={amount}
          onChange={(e) => setAmount(e.target.value)}
          error={localError ?? serverErrors.amountMinor}
        />
        <label className="text-sm font-semibold text-foil-200">
          Reason
          <select
            className="mt-1 block rounded-lg border border-foil-700 bg-night-950/60 px-3 py-2 font-normal text-foil-50"
            value={reason}
            onChange={(e) => setReason(e.target.value as RefundReason)}
          >
            {refundReasons.map((r) => (
              <option key={r} value={r}>
                {refundReasonWords[r]}
              </option>
            ))}
          </select>
        </label>
      </div>
      <TextField label="Note for the books (optional)" value={note} onChange={(e) => setNote(e.target.value)} error={serverErrors.note} />
      <Button type="submit" variant="danger">
        Refund…
      </Button>
      {refund.isError && !serverErrors.amountMinor && <Alert title="No refund was made">{errorMessage(refund.error)}</Alert>}
      <ConfirmDialog
        open={asking !== null}
        tone="danger"
        title={`Refund ${money(asking ?? 0, charge.currency)}?`}
        confirmLabel="Send the refund"
        cancelLabel="Don’t refund"
        pending={refund.isPending}
        onCancel={() => setAsking(null)}
        onConfirm={() =>
          asking !== null &&
          refund.mutate(
            { pledgeId: pledge.pledge.id, amountMinor: asking, reason, note, chargeId: charge.chargeId },
            {
              onSuccess: () => notify(`Refund of ${money(asking, charge.currency)} sent; ${who} gets an e-mail when it is booked.`),
              onSettled: () => setAsking(null),
            },
          )
        }
      >
        <p>
          The processor returns the money to {who}’s card ({refundReasonWords[reason].toLowerCase()}). The ledger moves when the processor
          confirms it; the receipt is then marked void and a corrected one issued.
        </p>
      </ConfirmDialog>
    </form>
  );
}

/** One pledge as finance sees it: payments, refunds (pending until the webhook books them), ledger rows, receipts. */
export function PledgeBooks({ pledgeId }: { pledgeId: string }) {
  const p = usePledge(pledgeId);
  if (p.isPending) return <Spinner label="Loading the pledge" />;
  if (p.isError) return <Alert title="Could not load the pledge">{errorMessage(p.error)}</Alert>;
  const d = p.data;
  return (
    <>
      <Card>
        <dl className="grid gap-3 sm:grid-cols-4">
          <div>
            <dt className="text-sm text-foil-400">Amount</dt>
            <dd className="text-lg font-bold text-foil-50">{money(d.pledge.amountMinor, d.pledge.currency)}</dd>
          </div>
          <div>
            <dt className="text-sm text-foil-400">Backer</dt>
            <dd className="break-words text-foil-50">{d.pledge.backer ? d.pledge.backer.email : 'anonymised (account deleted)'}</dd>
          </div>
          <div>
            <dt className="text-sm text-foil-400">For</dt>
            <dd className="text-foil-50">
              {d.pledge.campaignTitle} · {d.pledge.kind === 'monthly' ? 'crew membership' : 'one-time'}
            </dd>
          </div>
          <div>
            <dt className="text-sm text-foil-400">State</dt>
            <dd>
              <Badge tone={d.pledge.state === 'paid' ? 'good' : 'neutral'}>{pledgeStateLabels[d.pledge.state]}</Badge>
            </dd>
          </div>
        </dl>
      </Card>

      <Card>
        <h2 className="text-lg font-bold text-foil-50">Payments and refunds</h2>
        {d.charges.length === 0 && (
          <p className="mt-2 text-foil-300">No payment of this pledge is in the ledger, so there is nothing to refund.</p>
        )}
        {d.charges.map((c) => (
          <section key={c.chargeId} aria-label={`Payment ${c.chargeId}`} className="mt-4 rounded-xl border border-foil-700/60 p-4">
            <p className="text-foil-100">
              Payment <span className="font-mono text-xs">{c.chargeId}</span>: {money(c.amountMinor, c.currency)} ·{' '}
              {c.refundableMinor > 0 ? `${money(c.refundableMinor, c.currency)} can still be refunded` : 'fully refunded'}
            </p>
            <ul className="mt-2 space-y-1 text-sm">
              {d.refunds
                .filter((r) => r.chargeId === c.chargeId)
                .map((r) => (
                  <li key={r.id} className="flex flex-wrap items-center gap-2" data-testid="refund">
                    <span className="text-foil-100">Refund {money(r.amountMinor, r.currency)}</span>
                    <span className="text-foil-400">
                      {refundReasonWords[r.reason]} · {dateTime(r.createdAt)}
                    </span>
                    <Badge tone={r.state === 'booked' ? 'good' : 'attention'}>{refundStateWords[r.state]}</Badge>
                    {r.failureMessage && <span className="text-red-300">{r.failureMessage}</span>}
                  </li>
                ))}
            </ul>
            {c.demo ? (
              <p className="mt-2 text-sm text-foil-300">
                Demo data: this payment was written straight to the ledger and never made at the processor, so it cannot be refunded.
                Refunds work on pledges paid through the payment page.
              </p>
            ) : (
              c.refundableMinor > 0 && <RefundForm pledge={d} charge={c} />
            )}
          </section>
        ))}
      </Card>

      <Card>
        <h2 className="text-lg font-bold text-foil-50">Ledger</h2>
        <Table caption="Ledger rows of this pledge" className="mt-3">
          <THead>
            <Tr>
              <Th>When (UTC)</Th>
              <Th>What</Th>
              <Th>Amount</Th>
              <Th>Booked in</Th>
            </Tr>
          </THead>
          <TBody>
            {d.ledger.map((e) => (
              <Tr key={e.id}>
                <Td className="whitespace-nowrap">{dateTime(e.occurredAt)}</Td>
                <Td>{e.description}</Td>
                <Td className="whitespace-nowrap tabular-nums">{money(e.amountMinor, e.currency)}</Td>
                <Td className="whitespace-nowrap">{e.bookedMonth.slice(0, 7)}</Td>
              </Tr>
            ))}
          </TBody>
        </Table>
      </Card>

      <Card>
        <h2 className="text-lg font-bold text-foil-50">Receipts</h2>
        {d.receipts.length === 0 ? (
          <p className="mt-2 text-foil-300">No receipt yet: one is issued when a payment is booked.</p>
        ) : (
          <ul className="mt-2 space-y-1">
            {d.receipts.map((r) => (
              <li key={r.id}>
                <a className="text-amber-300 underline underline-offset-2" href={`/api/books/receipts/${r.id}.pdf`}>
                  Receipt {String(r.number).padStart(6, '0')} ({r.kind === 'correction' ? 'corrected' : 'payment'}),{' '}
                  {money(r.amountMinor, r.currency)}, PDF
                </a>
                {r.voided && (
                  <>
                    {' '}
                    <Badge tone="attention">void</Badge>
                  </>
                )}
              </li>
            ))}
          </ul>
        )}
      </Card>
    </>
  );
}
