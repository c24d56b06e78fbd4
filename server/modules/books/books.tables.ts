import { sql } from 'drizzle-orm';
import {
  pgTable,
  uuid,
  text,
  timestamp,
  bigint,
  bigserial,
  integer,
  jsonb,
  date,
  uniqueIndex,
  index,
  pgEnum,
  check,
  primaryKey,
} from 'drizzle-orm/pg-core';
import { accounts } from '../accounts/accounts.tables';
import { pledges } from '../pledges/pledges.tables';
import { ledgerEntries } from '../ledger/ledger.tables';
import { campaigns } from '../campaigns/campaigns.tables';

/** The organisation's details printed on receipts; one row (id = 1), edited by finance and admin. */
export const booksSettings = pgTable(
  'books_settings',
  {
    id: integer('id').primaryKey().default(1),
    organisationName: text('organisation_name').notNull().default(''),
    address: text('address').notNull().default(''),
    registrationNumber: text('registration_number').notNull().default(''),
    updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
    updatedBy: uuid('updated_by').references(() => accounts.id, { onDelete: 'set null' }),
  },
  (t) => [check('books_settings_single_row', sql`${t.id} = 1`)],
);

export const refundStatusEnum = pgEnum('refund_request_status', ['requested', 'sent', 'failed']);

/**
 * A refund finance asked for. The money moves in the ledger only when the processor's webhook lands; until
 * then the request shows as pending.
 */
export const refundRequests = pgTable(
  'refund_requests',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    pledgeId: uuid('pledge_id')
      .notNull()
      .references(() => pledges.id, { onDelete: 'restrict' }),
    processorChargeId: text('processor_charge_id').notNull(),
    amountMinor: bigint('amount_minor', { mode: 'number' }).notNull(),
    currency: text('currency').notNull(),
    reason: text('reason').notNull(),
    note: text('note').notNull().default(''),
    status: refundStatusEnum('status').notNull().default('requested'),
    processorRefundId: text('processor_refund_id'),
    failureMessage: text('failure_message'),
    requestedBy: uuid('requested_by').references(() => accounts.id, { onDelete: 'set null' }),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    index('refund_requests_pledge_idx').on(t.pledgeId),
    uniqueIndex('refund_requests_processor_key').on(t.processorRefundId),
    check('refund_requests_amount_positive', sql`${t.amountMinor} > 0`),
  ],
);

/** Gap-free counters: the row is locked in the transaction that takes a number (a sequence may leave gaps). */
export const numberCounters = pgTable('number_counters', {
  name: text('name').primaryKey(),
  lastValue: bigint('last_value', { mode: 'number' }).notNull().default(0),
});

export const receiptKindEnum = pgEnum('receipt_kind', ['payment', 'correction', 'yearly']);

export const receipts = pgTable(
  'receipts',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    number: bigint('number', { mode: 'number' }).notNull(),
    kind: receiptKindEnum('kind').notNull(),
    /** The charge this receipt is for (payment and correction receipts). */
    ledgerEntryId: bigint('ledger_entry_id', { mode: 'number' }).references(() => ledgerEntries.id, { onDelete: 'restrict' }),
    pledgeId: uuid('pledge_id').references(() => pledges.id, { onDelete: 'restrict' }),
    backerId: uuid('backer_id').references(() => accounts.id, { onDelete: 'set null' }),
    year: integer('year'),
    /** Amount received net of refunds, as printed. */
    amountMinor: bigint('amount_minor', { mode: 'number' }).notNull(),
    currency: text('currency').notNull(),
    replacesReceiptId: uuid('replaces_receipt_id'),
    voidedAt: timestamp('voided_at', { withTimezone: true }),
    issuedAt: timestamp('issued_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    uniqueIndex('receipts_number_key').on(t.number),
    index('receipts_backer_idx').on(t.backerId),
    index('receipts_entry_idx').on(t.ledgerEntryId),
  ],
);

export const reconRunStatusEnum = pgEnum('recon_run_status', ['queued', 'running', 'done', 'failed']);

export const reconRuns = pgTable('recon_runs', {
  id: uuid('id').primaryKey().defaultRandom(),
  status: reconRunStatusEnum('status').notNull().default('queued'),
  fromAt: timestamp('from_at', { withTimezone: true }).notNull(),
  toAt: timestamp('to_at', { withTimezone: true }).notNull(),
  /** 0..100 */
  progress: integer('progress').notNull().default(0),
  progressLabel: text('progress_label').notNull().default(''),
  /** Steps of the run: one per day of the range fetched from the processor, then matching, then payouts. */
  stepsDone: integer('steps_done').notNull().default(0),
  stepsTotal: integer('steps_total').notNull().default(0),
  /** Balance transactions fetched so far (staged for matching). */
  fetchedCount: integer('fetched_count').notNull().default(0),
  /** How many times the job has started on this run (1 = first attempt; more after a retry). */
  attempts: integer('attempts').notNull().default(0),
  summary: jsonb('summary'),
  error: text('error'),
  startedBy: uuid('started_by').references(() => accounts.id, { onDelete: 'set null' }),
  createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  finishedAt: timestamp('finished_at', { withTimezone: true }),
});

/** The processor's balance transactions as fetched by a run (staging for the one matching query). */
export const reconProcessorItems = pgTable(
  'recon_processor_items',
  {
    runId: uuid('run_id')
      .notNull()
      .references(() => reconRuns.id, { onDelete: 'cascade' }),
    balanceTransactionId: text('balance_transaction_id').notNull(),
    sourceId: text('source_id').notNull(),
    /** The ledger kind this transaction stands for: charge, refund, dispute, dispute_reversal, payout. */
    kind: text('kind').notNull(),
    amountMinor: bigint('amount_minor', { mode: 'number' }).notNull(),
    feeMinor: bigint('fee_minor', { mode: 'number' }).notNull(),
    currency: text('currency').notNull(),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull(),
  },
  (t) => [primaryKey({ columns: [t.runId, t.balanceTransactionId] })],
);

export const reconFindings = pgTable(
  'recon_findings',
  {
    id: bigserial('id', { mode: 'number' }).primaryKey(),
    runId: uuid('run_id')
      .notNull()
      .references(() => reconRuns.id, { onDelete: 'cascade' }),
    /** missing_in_ledger, missing_at_processor, amount_mismatch, currency_mismatch, fee_mismatch, double_charge, payout_sums, payout_differs */
    kind: text('kind').notNull(),
    /** Stable across runs: what the finding is about, so a resolution carries over to re-runs. */
    subjectKey: text('subject_key').notNull(),
    processorObjectId: text('processor_object_id'),
    ledgerEntryId: bigint('ledger_entry_id', { mode: 'number' }),
    pledgeId: uuid('pledge_id'),
    processorAmountMinor: bigint('processor_amount_minor', { mode: 'number' }),
    ledgerAmountMinor: bigint('ledger_amount_minor', { mode: 'number' }),
    currency: text('currency'),
    details: jsonb('details'),
  },
  (t) => [uniqueIndex('recon_findings_run_subject_key').on(t.runId, t.kind, t.subjectKey)],
);

/** A finding resolved by finance, by its stable key: it stays resolved in later runs. */
export const reconResolutions = pgTable(
  'recon_resolutions',
  {
    kind: text('kind').notNull(),
    subjectKey: text('subject_key').notNull(),
    action: text('action').notNull(),
    note: text('note').notNull().default(''),
    resolvedBy: uuid('resolved_by').references(() => accounts.id, { onDelete: 'set null' }),
    resolvedAt: timestamp('resolved_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [primaryKey({ columns: [t.kind, t.subjectKey] })],
);

/** A closed month (first day, UTC). Ledger rows that arrive later for it are booked in the next open month. */
export const monthCloses = pgTable('month_closes', {
  month: date('month', { mode: 'string' }).primaryKey(),
  closedAt: timestamp('closed_at', { withTimezone: true }).notNull().defaultNow(),
  closedBy: uuid('closed_by').references(() => accounts.id, { onDelete: 'set null' }),
  runId: uuid('run_id').references(() => reconRuns.id, { onDelete: 'set null' }),
  report: jsonb('report').notNull(),
});

/** A closed month's summary that finance published for backers (no personal data). */
export const monthlyAccounts = pgTable(
  'monthly_accounts',
  {
    campaignId: uuid('campaign_id')
      .notNull()
      .references(() => campaigns.id, { onDelete: 'cascade' }),
    month: date('month', { mode: 'string' })
      .notNull()
      .references(() => monthCloses.month, { onDelete: 'restrict' }),
    currency: text('currency').notNull(),
    raisedMinor: bigint('raised_minor', { mode: 'number' }).notNull(),
    feesMinor: bigint('fees_minor', { mode: 'number' }).notNull(),
    refundsMinor: bigint('refunds_minor', { mode: 'number' }).notNull(),
    disputesMinor: bigint('disputes_minor', { mode: 'number' }).notNull(),
    netMinor: bigint('net_minor', { mode: 'number' }).notNull(),
    backerCount: integer('backer_count').notNull(),
    publishedAt: timestamp('published_at', { withTimezone: true }).notNull().defaultNow(),
    publishedBy: uuid('published_by').references(() => accounts.id, { onDelete: 'set null' }),
  },
  (t) => [primaryKey({ columns: [t.campaignId, t.month] })],
);
