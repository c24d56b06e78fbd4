import { sql } from 'drizzle-orm';
import { pgTable, uuid, text, timestamp, bigint, boolean, uniqueIndex, index, pgEnum, check } from 'drizzle-orm/pg-core';
import { accounts } from '../accounts/accounts.tables';
import { campaigns, tiers, tierKindEnum } from '../campaigns/campaigns.tables';

export const pledgeStateEnum = pgEnum('pledge_state', [
  'started',
  'paid',
  'partly_refunded',
  'refunded',
  'disputed',
  'failed',
  'abandoned',
]);
/** none: the tier has no limit or no tier; held: counted in tiers.sold_count; released: given back. */
export const slotStateEnum = pgEnum('pledge_slot_state', ['none', 'held', 'released']);

export const pledges = pgTable(
  'pledges',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    campaignId: uuid('campaign_id')
      .notNull()
      .references(() => campaigns.id, { onDelete: 'restrict' }),
    tierId: uuid('tier_id').references(() => tiers.id, { onDelete: 'restrict' }),
    /** null once the backer deleted their account: the record stays for the books, anonymised. */
    backerId: uuid('backer_id').references(() => accounts.id, { onDelete: 'set null' }),
    /** null = shown as anonymous */
    publicName: text('public_name'),
    message: text('message'),
    kind: tierKindEnum('kind').notNull(),
    amountMinor: bigint('amount_minor', { mode: 'number' }).notNull(),
    currency: text('currency').notNull(),
    state: pledgeStateEnum('state').notNull().default('started'),
    failureCode: text('failure_code'),
    failureReason: text('failure_reason'),
    slotState: slotStateEnum('slot_state').notNull().default('none'),
    /** The client's key for this attempt: a repeated submit returns the same pledge. */
    idempotencyKey: text('idempotency_key').notNull(),
    processorCustomerId: text('processor_customer_id'),
    checkoutSessionId: text('checkout_session_id'),
    checkoutUrl: text('checkout_url'),
    paymentIntentId: text('payment_intent_id'),
    subscriptionId: text('subscription_id'),
    paidAt: timestamp('paid_at', { withTimezone: true }),
    confirmationSentAt: timestamp('confirmation_sent_at', { withTimezone: true }),
    anonymisedAt: timestamp('anonymised_at', { withTimezone: true }),
    /** Invented by the demo seed, not by a processor. */
    isDemo: boolean('is_demo').notNull().default(false),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    uniqueIndex('pledges_idempotency_key').on(t.idempotencyKey),
    uniqueIndex('pledges_checkout_session_key').on(t.checkoutSessionId),
    uniqueIndex('pledges_payment_intent_key').on(t.paymentIntentId),
    uniqueIndex('pledges_subscription_key').on(t.subscriptionId),
    index('pledges_backer_idx').on(t.backerId, t.createdAt),
    index('pledges_campaign_idx').on(t.campaignId, t.state),
    check('pledges_amount_positive', sql`${t.amountMinor} > 0`),
  ],
);

export const memberships = pgTable(
  'memberships',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    pledgeId: uuid('pledge_id')
      .notNull()
      .references(() => pledges.id, { onDelete: 'restrict' }),
    backerId: uuid('backer_id').references(() => accounts.id, { onDelete: 'set null' }),
    tierId: uuid('tier_id').references(() => tiers.id, { onDelete: 'restrict' }),
    subscriptionId: text('subscription_id').notNull(),
    customerId: text('customer_id').notNull(),
    /** The processor's subscription status: active, past_due, unpaid, canceled … */
    status: text('status').notNull(),
    currentPeriodEnd: timestamp('current_period_end', { withTimezone: true }),
    cancelAtPeriodEnd: boolean('cancel_at_period_end').notNull().default(false),
    endedAt: timestamp('ended_at', { withTimezone: true }),
    isDemo: boolean('is_demo').notNull().default(false),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    uniqueIndex('memberships_subscription_key').on(t.subscriptionId),
    uniqueIndex('memberships_pledge_key').on(t.pledgeId),
    index('memberships_backer_idx').on(t.backerId),
  ],
);
