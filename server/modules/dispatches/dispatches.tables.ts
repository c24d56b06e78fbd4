import { sql } from 'drizzle-orm';
import { pgTable, uuid, text, timestamp, integer, jsonb, uniqueIndex, index, pgEnum, check, boolean } from 'drizzle-orm/pg-core';
import { accounts } from '../accounts/accounts.tables';

export const dispatchStateEnum = pgEnum('dispatch_state', ['draft', 'scheduled', 'published', 'withdrawn']);
export const audienceKindEnum = pgEnum('dispatch_audience', ['everyone', 'backers', 'tiers', 'crew']);

/** A chart frozen into the dispatch when it was saved: the PNG lives in storage, the words beside it here. */
export type StoredDispatchChart = { snapshotId: string; title: string; caption: string; alt: string; imageKey: string };

export const dispatches = pgTable(
  'dispatches',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    slug: text('slug').notNull(),
    title: text('title').notNull(),
    bodyMarkdown: text('body_markdown').notNull().default(''),
    heroImageKey: text('hero_image_key'),
    heroAlt: text('hero_alt').notNull().default(''),
    charts: jsonb('charts').$type<StoredDispatchChart[]>().notNull().default([]),
    audienceKind: audienceKindEnum('audience_kind').notNull().default('everyone'),
    audienceTierIds: uuid('audience_tier_ids')
      .array()
      .notNull()
      .default(sql`'{}'::uuid[]`),
    state: dispatchStateEnum('state').notNull().default('draft'),
    /** When a scheduled dispatch goes out; the publish job carries the same time. */
    publishAt: timestamp('publish_at', { withTimezone: true }),
    publishedAt: timestamp('published_at', { withTimezone: true }),
    withdrawnAt: timestamp('withdrawn_at', { withTimezone: true }),
    emailOnPublish: boolean('email_on_publish').notNull().default(false),
    /** 0 until first published; each edit after that adds a row to dispatch_versions. */
    version: integer('version').notNull().default(0),
    authorId: uuid('author_id').references(() => accounts.id, { onDelete: 'set null' }),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    uniqueIndex('dispatches_slug_key').on(t.slug),
    index('dispatches_feed_idx').on(t.state, t.publishedAt),
    check('dispatches_scheduled_has_time', sql`${t.state} <> 'scheduled' OR ${t.publishAt} IS NOT NULL`),
    check('dispatches_tiers_listed', sql`${t.audienceKind} <> 'tiers' OR cardinality(${t.audienceTierIds}) > 0`),
  ],
);

/** What readers saw at each published version: the first publish is version 1, each later edit one more. */
export const dispatchVersions = pgTable(
  'dispatch_versions',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    dispatchId: uuid('dispatch_id')
      .notNull()
      .references(() => dispatches.id, { onDelete: 'cascade' }),
    version: integer('version').notNull(),
    title: text('title').notNull(),
    bodyMarkdown: text('body_markdown').notNull(),
    heroImageKey: text('hero_image_key'),
    charts: jsonb('charts').$type<StoredDispatchChart[]>().notNull(),
    editedBy: uuid('edited_by').references(() => accounts.id, { onDelete: 'set null' }),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex('dispatch_versions_key').on(t.dispatchId, t.version)],
);

/**
 * One row per "e-mail this dispatch" decision, written in the publish transaction (the outbox for the
 * fan-out). The fan-out job resolves the audience when it runs and fills the mail queue from it.
 */
export const dispatchSends = pgTable(
  'dispatch_sends',
  {
    dispatchId: uuid('dispatch_id')
      .primaryKey()
      .references(() => dispatches.id, { onDelete: 'cascade' }),
    /** pending: waiting for the fan-out; sending: recipients queued; done: every row sent or failed. */
    status: text('status').notNull().default('pending'),
    recipientCount: integer('recipient_count'),
    /** The mail-queue batch keys are `dispatch/<id>/<n>` for n below this. */
    batchCount: integer('batch_count'),
    requestedBy: uuid('requested_by').references(() => accounts.id, { onDelete: 'set null' }),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    resolvedAt: timestamp('resolved_at', { withTimezone: true }),
  },
  (t) => [check('dispatch_sends_status', sql`${t.status} IN ('pending', 'sending', 'done')`)],
);

/** Files behind the storage interface (hero images, frozen chart PNGs); the bytes live in storage, keyed the same. */
export const storedFiles = pgTable(
  'stored_files',
  {
    key: text('key').primaryKey(),
    contentType: text('content_type').notNull(),
    byteSize: integer('byte_size').notNull(),
    width: integer('width'),
    height: integer('height'),
    purpose: text('purpose').notNull(),
    ownerId: uuid('owner_id').references(() => accounts.id, { onDelete: 'set null' }),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index('stored_files_purpose_idx').on(t.purpose, t.createdAt)],
);
