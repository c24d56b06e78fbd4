import { and, asc, desc, eq, sql } from 'drizzle-orm';
import type { Db } from '../../db/client';
import { ledgerEntries } from './ledger.tables';

export type LedgerInsert = typeof ledgerEntries.$inferInsert;
export type LedgerRow = typeof ledgerEntries.$inferSelect;
type Tx = Pick<Db, 'insert' | 'select'>;

/**
 * Appends a ledger row. The unique (processor object, kind) key turns a replay into a no-op; returns
 * whether this call inserted the row.
 */
export async function appendLedgerEntry(tx: Tx, entry: LedgerInsert): Promise<boolean> {
  const inserted = await tx
    .insert(ledgerEntries)
    .values({ ...entry, currency: entry.currency.toUpperCase() })
    .onConflictDoNothing({ target: [ledgerEntries.processorObjectId, ledgerEntries.kind] })
    .returning({ id: ledgerEntries.id });
  return inserted.length > 0;
}

/** Charged, refunded and disputed totals of one pledge, in its minor units. */
export async function pledgeTotals(tx: Tx, pledgeId: string) {
  const [row] = await tx
    .select({
      chargedMinor: sql<string>`coalesce(sum(${ledgerEntries.amountMinor}) filter (where ${ledgerEntries.kind} = 'charge'), 0)`,
      refundedMinor: sql<string>`coalesce(-sum(${ledgerEntries.amountMinor}) filter (where ${ledgerEntries.kind} = 'refund'), 0)`,
      disputes: sql<number>`count(*) filter (where ${ledgerEntries.kind} = 'dispute')::int`,
      firstChargeAt: sql<Date | null>`min(${ledgerEntries.occurredAt}) filter (where ${ledgerEntries.kind} = 'charge')`,
    })
    .from(ledgerEntries)
    .where(eq(ledgerEntries.pledgeId, pledgeId));
  return {
    chargedMinor: Number(row?.chargedMinor ?? 0),
    refundedMinor: Number(row?.refundedMinor ?? 0),
    disputes: row?.disputes ?? 0,
    firstChargeAt: row?.firstChargeAt ? new Date(row.firstChargeAt) : null,
  };
}

export async function entriesOfPledge(tx: Tx, pledgeId: string) {
  return tx
    .select()
    .from(ledgerEntries)
    .where(eq(ledgerEntries.pledgeId, pledgeId))
    .orderBy(asc(ledgerEntries.occurredAt), asc(ledgerEntries.id));
}

export async function pledgeIdOfCharge(tx: Tx, chargeId: string): Promise<string | null> {
  const [row] = await tx
    .select({ pledgeId: ledgerEntries.pledgeId })
    .from(ledgerEntries)
    .where(and(eq(ledgerEntries.processorChargeId, chargeId), eq(ledgerEntries.kind, 'charge')));
  return row?.pledgeId ?? null;
}

export async function listLedger(db: Db, opts: { limit: number; campaignId?: string }) {
  const rows = await db
    .select()
    .from(ledgerEntries)
    .where(opts.campaignId ? eq(ledgerEntries.campaignId, opts.campaignId) : undefined)
    .orderBy(desc(ledgerEntries.occurredAt), desc(ledgerEntries.id))
    .limit(opts.limit);
  return rows.map((r) => ({
    id: r.id,
    kind: r.kind,
    amountMinor: r.amountMinor,
    currency: r.currency,
    campaignId: r.campaignId,
    pledgeId: r.pledgeId,
    processorObjectId: r.processorObjectId,
    processorChargeId: r.processorChargeId,
    processorPaymentIntentId: r.processorPaymentIntentId,
    processorBalanceTransactionId: r.processorBalanceTransactionId,
    processorInvoiceId: r.processorInvoiceId,
    description: r.description,
    occurredAt: r.occurredAt.toISOString(),
    recordedAt: r.recordedAt.toISOString(),
    isDemo: r.isDemo,
  }));
}
