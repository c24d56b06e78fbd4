import { sql } from 'drizzle-orm';
import { pgTable, uuid, text, timestamp, bigint, bigserial, boolean, date, uniqueIndex, index, pgEnum, check } from 'drizzle-orm/pg-core';
import { campaigns } from '../campaigns/campaigns.tables';
import { pledges } from '../pledges/pledges.tables';

export const ledgerKindEnum = pgEnum('ledger_kind', ['charge', 'refund', 'dispute', 'fee', 'payout', 'dispute_reversal']);

/**
 * Every money movement, immutable (a trigger refuses UPDATE and DELETE). Amounts are signed minor units
 * as seen from the processor balance: charge +, refund/dispute/fee/payout −.
 */
export const ledgerEntries = pgTable(
  'ledger_entries',
  {
    id: bigserial('id', { mode: 'number' }).primaryKey(),
    kind: ledgerKindEnum('kind').notNull(),
    amountMinor: bigint('amount_minor', { mode: 'number' }).notNull(),
    currency: text('currency').notNull(),
    campaignId: uuid('campaign_id').references(() => campaigns.id, { onDelete: 'restrict' }),
    pledgeId: uuid('pledge_id').references(() => pledges.id, { onDelete: 'restrict' }),
    /** The processor object this row stands for (ch_, re_, dp_, txn_ for fees, po_). */
    processorObjectId: text('processor_object_id').notNull(),
    processorChargeId: text('processor_charge_id'),
    processorPaymentIntentId: text('processor_payment_intent_id'),
    processorBalanceTransactionId: text('processor_balance_transaction_id'),
    processorInvoiceId: text('processor_invoice_id'),
    description: text('description').notNull().default(''),
    occurredAt: timestamp('occurred_at', { withTimezone: true }).notNull(),
    recordedAt: timestamp('recorded_at', { withTimezone: true }).notNull().defaultNow(),
    isDemo: boolean('is_demo').notNull().default(false),
    /** The month (first day, UTC) this row counts in: its own, or the next open one when that was closed (set by a trigger). */
    bookedMonth: date('booked_month', { mode: 'string' }),
  },
  (t) => [
    uniqueIndex('ledger_entries_object_kind_key').on(t.processorObjectId, t.kind),
    index('ledger_entries_campaign_idx').on(t.campaignId, t.kind),
    index('ledger_entries_pledge_idx').on(t.pledgeId),
    check('ledger_entries_currency_iso', sql`${t.currency} ~ '^[A-Z]{3}$'`),
    check(
      'ledger_entries_sign',
      sql`(${t.kind}::text IN ('charge', 'dispute_reversal') AND ${t.amountMinor} > 0) OR (${t.kind}::text NOT IN ('charge', 'dispute_reversal') AND ${t.amountMinor} < 0)`,
    ),
  ],
);
