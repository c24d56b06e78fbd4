import { pgTable, uuid, text, timestamp, bigint, index } from 'drizzle-orm/pg-core';
import { accounts } from '../accounts/accounts.tables';

/** Webhook events already applied: the event id makes a replay a no-op. */
export const processedEvents = pgTable('processed_events', {
  eventId: text('event_id').primaryKey(),
  type: text('type').notNull(),
  processedAt: timestamp('processed_at', { withTimezone: true }).notNull().defaultNow(),
});

/** The processor customer that stands for a backer account. */
export const paymentCustomers = pgTable('payment_customers', {
  accountId: uuid('account_id')
    .primaryKey()
    .references(() => accounts.id, { onDelete: 'cascade' }),
  customerId: text('customer_id').notNull().unique(),
  createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
});

/**
 * Money events of the processor account that match no pledge of ours: a refund or dispute of a charge this
 * app never made (the account is shared with other tools, or the charge was made by hand). The webhook
 * acknowledges them and keeps one row per event here for the reconciliation to report; nothing else reads
 * them. `amount_minor` is the event object's amount in minor units of `currency` (upper case): a refund's or
 * dispute's amount, or for a charge event the amount refunded of that charge so far.
 */
export const processorEventUnmatched = pgTable(
  'processor_event_unmatched',
  {
    eventId: text('event_id').primaryKey(),
    eventType: text('event_type').notNull(),
    /** charge, refund or dispute */
    objectType: text('object_type').notNull(),
    objectId: text('object_id').notNull(),
    chargeId: text('charge_id'),
    paymentIntentId: text('payment_intent_id'),
    customerId: text('customer_id'),
    amountMinor: bigint('amount_minor', { mode: 'number' }),
    currency: text('currency'),
    /** When the processor created the event. */
    occurredAt: timestamp('occurred_at', { withTimezone: true }).notNull(),
    receivedAt: timestamp('received_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index('processor_event_unmatched_received_idx').on(t.receivedAt)],
);
