import { sql } from 'drizzle-orm';
import { pgTable, uuid, text, timestamp, bigint, integer, boolean, date, uniqueIndex, index, pgEnum, check } from 'drizzle-orm/pg-core';

export const tierKindEnum = pgEnum('tier_kind', ['one-time', 'monthly']);

export const campaigns = pgTable(
  'campaigns',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    slug: text('slug').notNull(),
    title: text('title').notNull(),
    summary: text('summary').notNull().default(''),
    story: text('story').notNull().default(''),
    // Money: integer minor units of `currency` (ISO 4217, upper case).
    goalMinor: bigint('goal_minor', { mode: 'number' }).notNull(),
    currency: text('currency').notNull(),
    startsAt: timestamp('starts_at', { withTimezone: true }).notNull(),
    endsAt: timestamp('ends_at', { withTimezone: true }).notNull(),
    /** The processor product the checkout lines are billed under; created on the first pledge. */
    processorProductId: text('processor_product_id'),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    uniqueIndex('campaigns_slug_key').on(t.slug),
    check('campaigns_goal_positive', sql`${t.goalMinor} > 0`),
    check('campaigns_currency_iso', sql`${t.currency} ~ '^[A-Z]{3}$'`),
    check('campaigns_ends_after_start', sql`${t.endsAt} > ${t.startsAt}`),
  ],
);

export const tiers = pgTable(
  'tiers',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    campaignId: uuid('campaign_id')
      .notNull()
      .references(() => campaigns.id, { onDelete: 'cascade' }),
    title: text('title').notNull(),
    description: text('description').notNull().default(''),
    minAmountMinor: bigint('min_amount_minor', { mode: 'number' }).notNull(),
    kind: tierKindEnum('kind').notNull(),
    /** null = unlimited */
    quantityLimit: integer('quantity_limit'),
    /** Slots taken: held by an open checkout or sold. Changed only by conditional updates. */
    soldCount: integer('sold_count').notNull().default(0),
    estimatedDelivery: date('estimated_delivery'),
    /** Processor price for the minimum amount of a monthly tier; created on first use. */
    processorPriceId: text('processor_price_id'),
    position: integer('position').notNull().default(0),
    active: boolean('active').notNull().default(true),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    index('tiers_campaign_idx').on(t.campaignId, t.position),
    check('tiers_min_amount_positive', sql`${t.minAmountMinor} > 0`),
    check('tiers_sold_nonnegative', sql`${t.soldCount} >= 0`),
    check('tiers_quantity_positive', sql`${t.quantityLimit} IS NULL OR ${t.quantityLimit} > 0`),
  ],
);

export const stretchTargets = pgTable(
  'stretch_targets',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    campaignId: uuid('campaign_id')
      .notNull()
      .references(() => campaigns.id, { onDelete: 'cascade' }),
    amountMinor: bigint('amount_minor', { mode: 'number' }).notNull(),
    title: text('title').notNull(),
    description: text('description').notNull().default(''),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    index('stretch_targets_campaign_idx').on(t.campaignId, t.amountMinor),
    check('stretch_targets_amount_positive', sql`${t.amountMinor} > 0`),
  ],
);

/** The flight budget: what the goal pays for, line by line, filled in `position` order by the money raised. */
export const budgetLines = pgTable(
  'budget_lines',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    campaignId: uuid('campaign_id')
      .notNull()
      .references(() => campaigns.id, { onDelete: 'cascade' }),
    position: integer('position').notNull(),
    name: text('name').notNull(),
    amountMinor: bigint('amount_minor', { mode: 'number' }).notNull(),
    reason: text('reason').notNull().default(''),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    uniqueIndex('budget_lines_campaign_position_key').on(t.campaignId, t.position),
    check('budget_lines_amount_positive', sql`${t.amountMinor} > 0`),
  ],
);
