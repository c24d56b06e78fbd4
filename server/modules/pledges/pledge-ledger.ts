// Moves a pledge through its states from ledger facts, inside the caller's transaction. Every function is
// idempotent: a replayed or reordered event finds the rows already there and changes nothing.
import { and, eq, sql } from 'drizzle-orm';
import type Stripe from 'stripe';
import type { Db } from '../../db/client';
import { pledges } from './pledges.tables';
import { tiers } from '../campaigns/campaigns.tables';
import { appendLedgerEntry, pledgeTotals } from '../ledger/ledger.repository';
import { moneyStateOf, nextPledgeState } from '../../../shared/pledge-states';
import { ledgerEntries } from '../ledger/ledger.tables';
import { correctReceiptAfterRefund, issuePaymentReceipt } from '../books/receipts.repository';

export type Tx = Parameters<Parameters<Db['transaction']>[0]>[0];
export type PledgeRow = typeof pledges.$inferSelect;

const at = (unixSeconds: number) => new Date(unixSeconds * 1000);
const idOf = (v: string | { id: string } | null | undefined) => (typeof v === 'string' ? v : (v?.id ?? null));

/** Locks the pledge row for the rest of the transaction, so events of one pledge apply one at a time. */
export async function lockPledge(tx: Tx, pledgeId: string): Promise<PledgeRow | undefined> {
  const [row] = await tx.select().from(pledges).where(eq(pledges.id, pledgeId)).for('update');
  return row;
}

/** The charge and its balance transaction, as fetched from the processor. */
export type ChargeFacts = { charge: Stripe.Charge; balanceTransaction: Stripe.BalanceTransaction | null; invoiceId?: string | null };

/** A succeeded charge → a `charge` row and, when the processor took one, a `fee` row. */
export async function recordCharge(tx: Tx, pledge: PledgeRow, facts: ChargeFacts, isDemo = false): Promise<boolean> {
  const { charge, balanceTransaction: bt } = facts;
  if (charge.status !== 'succeeded' || !charge.paid) return false;
  const base = {
    currency: charge.currency,
    campaignId: pledge.campaignId,
    pledgeId: pledge.id,
    processorChargeId: charge.id,
    processorPaymentIntentId: idOf(charge.payment_intent),
    processorBalanceTransactionId: bt?.id ?? null,
    processorInvoiceId: facts.invoiceId ?? null,
    isDemo,
  };
  const inserted = await appendLedgerEntry(tx, {
    ...base,
    kind: 'charge',
    amountMinor: charge.amount,
    processorObjectId: charge.id,
    description: facts.invoiceId ? 'Membership payment' : 'Pledge payment',
    occurredAt: at(charge.created),
  });
  if (bt && bt.fee > 0) {
    await appendLedgerEntry(tx, {
      ...base,
      currency: bt.currency,
      kind: 'fee',
      amountMinor: -bt.fee,
      processorObjectId: bt.id,
      description: 'Processor fee on a charge',
      occurredAt: at(bt.created),
    });
  }
  if (inserted) {
    const [row] = await tx
      .select({ id: ledgerEntries.id })
      .from(ledgerEntries)
      .where(and(eq(ledgerEntries.processorObjectId, charge.id), eq(ledgerEntries.kind, 'charge')));
    if (row) await issuePaymentReceipt(tx, row.id);
  }
  return inserted;
}

/** The processor's refund reasons, as the ledger and receipts say them. */
const refundReasonInWords: Record<string, string> = {
  requested_by_customer: 'the backer asked',
  duplicate: 'paid twice',
  fraudulent: 'fraudulent payment',
};

export async function recordRefund(tx: Tx, pledge: PledgeRow, refund: Stripe.Refund): Promise<boolean> {
  if (refund.status !== 'succeeded' && refund.status !== 'pending') return false;
  const inserted = await appendLedgerEntry(tx, {
    kind: 'refund',
    amountMinor: -refund.amount,
    currency: refund.currency,
    campaignId: pledge.campaignId,
    pledgeId: pledge.id,
    processorObjectId: refund.id,
    processorChargeId: idOf(refund.charge),
    processorPaymentIntentId: idOf(refund.payment_intent),
    processorBalanceTransactionId: idOf(refund.balance_transaction),
    description: refund.reason ? `Refund (${refundReasonInWords[refund.reason] ?? refund.reason.replaceAll('_', ' ')})` : 'Refund',
    occurredAt: at(refund.created),
  });
  const chargeId = idOf(refund.charge);
  if (inserted && chargeId) await correctReceiptAfterRefund(tx, chargeId);
  return inserted;
}

export async function recordDispute(tx: Tx, pledge: PledgeRow, dispute: Stripe.Dispute): Promise<boolean> {
  const inserted = await appendLedgerEntry(tx, {
    kind: 'dispute',
    amountMinor: -dispute.amount,
    currency: dispute.currency,
    campaignId: pledge.campaignId,
    pledgeId: pledge.id,
    processorObjectId: dispute.id,
    processorChargeId: idOf(dispute.charge),
    processorPaymentIntentId: idOf(dispute.payment_intent),
    processorBalanceTransactionId: dispute.balance_transactions?.[0]?.id ?? null,
    description: `Dispute opened (${dispute.reason})`,
    occurredAt: at(dispute.created),
  });
  for (const bt of dispute.balance_transactions ?? []) {
    if (bt.amount > 0) {
      // The withdrawn amount came back: the dispute was won.
      await appendLedgerEntry(tx, {
        kind: 'dispute_reversal',
        amountMinor: bt.amount,
        currency: bt.currency,
        campaignId: pledge.campaignId,
        pledgeId: pledge.id,
        processorObjectId: dispute.id,
        processorChargeId: idOf(dispute.charge),
        processorBalanceTransactionId: bt.id,
        description: 'Dispute won: amount reinstated',
        occurredAt: at(bt.created),
      });
    }
    if (bt.fee > 0) {
      await appendLedgerEntry(tx, {
        kind: 'fee',
        amountMinor: -bt.fee,
        currency: bt.currency,
        campaignId: pledge.campaignId,
        pledgeId: pledge.id,
        processorObjectId: bt.id,
        processorChargeId: idOf(dispute.charge),
        processorBalanceTransactionId: bt.id,
        description: 'Dispute fee',
        occurredAt: at(bt.created),
      });
    }
  }
  return inserted;
}

async function holdSlotAgain(tx: Tx, pledge: PledgeRow) {
  // Money arrived after the slot was given back (an expired checkout paid late): it is sold all the same.
  if (pledge.slotState !== 'released' || !pledge.tierId) return pledge.slotState;
  await tx
    .update(tiers)
    .set({ soldCount: sql`${tiers.soldCount} + 1` })
    .where(eq(tiers.id, pledge.tierId));
  return 'held' as const;
}

export async function releaseSlot(tx: Tx, pledge: PledgeRow): Promise<PledgeRow['slotState']> {
  if (pledge.slotState !== 'held' || !pledge.tierId) return pledge.slotState;
  await tx
    .update(tiers)
    .set({ soldCount: sql`greatest(${tiers.soldCount} - 1, 0)` })
    .where(eq(tiers.id, pledge.tierId));
  return 'released';
}

/**
 * Derives the state from the ledger through the state machine (shared/pledge-states.ts): money outranks the
 * states without money. Returns `firstPaid` when this call moved it to a money state for the first time and
 * claimed the one confirmation e-mail.
 */
export async function refreshPledgeState(tx: Tx, pledge: PledgeRow): Promise<{ pledge: PledgeRow; firstPaid: boolean }> {
  const totals = await pledgeTotals(tx, pledge.id);
  const money = moneyStateOf(totals);
  if (!money) return { pledge, firstPaid: false };
  const state = nextPledgeState(pledge.state, { kind: 'money', state: money });
  const claimMail = pledge.confirmationSentAt === null;
  const [row] = await tx
    .update(pledges)
    .set({
      state,
      paidAt: pledge.paidAt ?? totals.firstChargeAt ?? new Date(),
      failureCode: null,
      failureReason: null,
      slotState: await holdSlotAgain(tx, pledge),
      ...(claimMail ? { confirmationSentAt: new Date() } : {}),
      updatedAt: new Date(),
    })
    .where(eq(pledges.id, pledge.id))
    .returning();
  return { pledge: row!, firstPaid: claimMail };
}

/** A declined attempt: the pledge stays unpaid with the reason; the checkout may still be retried. */
export async function markFailed(tx: Tx, pledge: PledgeRow, failure: { code: string | null; reason: string }) {
  if (nextPledgeState(pledge.state, { kind: 'declined' }) !== 'failed') {
    // Closed before the decline arrived: the state stays, but the decline is still why nothing was paid.
    if (pledge.state !== 'abandoned') return pledge;
    const [kept] = await tx
      .update(pledges)
      .set({ failureCode: failure.code ?? 'declined', failureReason: failure.reason, updatedAt: new Date() })
      .where(eq(pledges.id, pledge.id))
      .returning();
    return kept!;
  }
  const [row] = await tx
    .update(pledges)
    .set({ state: 'failed', failureCode: failure.code, failureReason: failure.reason, updatedAt: new Date() })
    .where(eq(pledges.id, pledge.id))
    .returning();
  return row!;
}

/**
 * The checkout closed without payment (expired or cancelled): final, so it outranks a decline whichever came
 * first; the reason is the closing one, and the tier slot goes back.
 */
export async function markAbandoned(tx: Tx, pledge: PledgeRow, reason: string) {
  if (pledge.state === 'abandoned' || nextPledgeState(pledge.state, { kind: 'closed' }) !== 'abandoned') return pledge;
  const [row] = await tx
    .update(pledges)
    .set({
      state: 'abandoned',
      // A decline seen before the close stays the reason (the same end whichever event came first).
      failureCode: pledge.failureCode,
      failureReason: pledge.failureCode ? pledge.failureReason : reason,
      slotState: await releaseSlot(tx, pledge),
      checkoutUrl: null,
      updatedAt: new Date(),
    })
    .where(eq(pledges.id, pledge.id))
    .returning();
  return row!;
}
