import { pgTable, uuid, text, timestamp } from 'drizzle-orm/pg-core';
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
