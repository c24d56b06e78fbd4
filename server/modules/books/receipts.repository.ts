// Receipt numbers come from a counter row locked in the transaction that records the payment: a number is
// taken only if that transaction commits, so the numbers have no gaps (a sequence would leave one for every
// rolled-back transaction).
import { and, eq, isNull, sql } from 'drizzle-orm';
import type { Db } from '../../db/client';
import { numberCounters, receipts } from './books.tables';
import { ledgerEntries } from '../ledger/ledger.tables';
import { pledges } from '../pledges/pledges.tables';

type Tx = Parameters<Parameters<Db['transaction']>[0]>[0];

export async function takeNumber(tx: Tx, name = 'receipt'): Promise<number> {
  const [row] = await tx
    .insert(numberCounters)
    .values({ name, lastValue: 1 })
    .onConflictDoUpdate({ target: numberCounters.name, set: { lastValue: sql`${numberCounters.lastValue} + 1` } })
    .returning({ value: numberCounters.lastValue });
  return row!.value;
}

/** A payment receipt for a newly recorded charge (the caller's transaction). Idempotent per charge row. */
export async function issuePaymentReceipt(tx: Tx, chargeEntryId: number) {
  const [existing] = await tx.select({ id: receipts.id }).from(receipts).where(eq(receipts.ledgerEntryId, chargeEntryId));
  if (existing) return;
  const [entry] = await tx
    .select({
      amountMinor: ledgerEntries.amountMinor,
      currency: ledgerEntries.currency,
      pledgeId: ledgerEntries.pledgeId,
      backerId: pledges.backerId,
    })
    .from(ledgerEntries)
    .leftJoin(pledges, eq(pledges.id, ledgerEntries.pledgeId))
    .where(and(eq(ledgerEntries.id, chargeEntryId), eq(ledgerEntries.kind, 'charge')));
  if (!entry) return;
  await tx.insert(receipts).values({
    number: await takeNumber(tx),
    kind: 'payment',
    ledgerEntryId: chargeEntryId,
    pledgeId: entry.pledgeId,
    backerId: entry.backerId,
    amountMinor: entry.amountMinor,
    currency: entry.currency,
  });
}

/**
 * After a refund of a charge: the charge's current receipt is voided and a corrected one issued for what
 * remains (none when nothing remains).
 */
export async function correctReceiptAfterRefund(tx: Tx, processorChargeId: string) {
  const [charge] = await tx
    .select({ id: ledgerEntries.id, amountMinor: ledgerEntries.amountMinor })
    .from(ledgerEntries)
    .where(and(eq(ledgerEntries.processorObjectId, processorChargeId), eq(ledgerEntries.kind, 'charge')));
  if (!charge) return;
  const [current] = await tx
    .select()
    .from(receipts)
    .where(and(eq(receipts.ledgerEntryId, charge.id), isNull(receipts.voidedAt)))
    .for('update');
  if (!current) return;
  const [refunded] = await tx
    .select({ sum: sql<string>`coalesce(-sum(${ledgerEntries.amountMinor}), 0)` })
    .from(ledgerEntries)
    .where(and(eq(ledgerEntries.processorChargeId, processorChargeId), eq(ledgerEntries.kind, 'refund')));
  const remaining = charge.amountMinor - Number(refunded?.sum ?? 0);
  if (remaining === current.amountMinor) return;
  await tx.update(receipts).set({ voidedAt: new Date() }).where(eq(receipts.id, current.id));
  if (remaining <= 0) return;
  await tx.insert(receipts).values({
    number: await takeNumber(tx),
    kind: 'correction',
    ledgerEntryId: charge.id,
    pledgeId: current.pledgeId,
    backerId: current.backerId,
    amountMinor: remaining,
    currency: current.currency,
    replacesReceiptId: current.id,
  });
}
