import { pgTable, uuid, text, timestamp, integer, jsonb, index, pgEnum } from 'drizzle-orm/pg-core';
import { sql } from 'drizzle-orm';
import { accounts } from '../accounts/accounts.tables';

/** An attachment the sender renders at send time (the outbox row holds a reference, not the bytes). */
export type MailAttachmentRef = { kind: 'receipt'; receiptId: string };

export const mailStateEnum = pgEnum('mail_state', ['queued', 'sending', 'sent', 'failed']);
export const mailCategoryEnum = pgEnum('mail_category', ['transactional', 'dispatch']);

/**
 * The outbox: one row per message the product sends, written in the same transaction as the change that
 * causes it (queueMail), sent by a worker (server/jobs/mail-sender.ts). The idempotency key is unique here and
 * is sent to the mail service, so a row sent twice (a worker died after the service accepted it) is one message.
 */
/**
 * The data that many copies of one mail share (a dispatch to 10,000 readers: title, body, charts …), stored once
 * instead of on every outbox row. Written before (or with) the rows that name it and never changed, so a sender may
 * keep it once read. Removed by housekeeping once no outbox row names it any more.
 */
export const mailShared = pgTable('mail_shared', {
  key: text('key').primaryKey(),
  template: text('template').notNull(),
  data: jsonb('data').$type<Record<string, unknown>>().notNull(),
  createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
});

export const mailQueue = pgTable(
  'mail_queue',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    idempotencyKey: text('idempotency_key').notNull().unique(),
    template: text('template').notNull(),
    toAddress: text('to_address').notNull(),
    /**
     * The template's data (checked by its schema when queued). With a shared key, only this message's own fields
     * (e.g. its unsubscribe link): the rest is the shared row's data, stored once for all copies (mail_shared).
     */
    data: jsonb('data').notNull(),
    /** The mail_shared row whose data this message's own fields complete; null when `data` is the whole data. */
    sharedKey: text('shared_key'),
    category: mailCategoryEnum('category').notNull(),
    /** Extra message headers (List-Unsubscribe …). */
    headers: jsonb('headers')
      .$type<Record<string, string>>()
      .notNull()
      .default(sql`'{}'::jsonb`),
    /** Files sent with the message, by reference (rendered when sent): e.g. { kind: 'receipt', receiptId }. */
    attachments: jsonb('attachments')
      .$type<MailAttachmentRef[]>()
      .notNull()
      .default(sql`'[]'::jsonb`),
    /**
     * Rows with one batch key go to the service in one batch call, under that key; the batch is claimed and leased
     * through its mail_batches row, so its messages stay `queued` until their answer is written.
     */
    batchKey: text('batch_key'),
    accountId: uuid('account_id').references(() => accounts.id, { onDelete: 'set null' }),
    state: mailStateEnum('state').notNull().default('queued'),
    attempts: integer('attempts').notNull().default(0),
    nextAttemptAt: timestamp('next_attempt_at', { withTimezone: true }).notNull().defaultNow(),
    /** While `sending`: the claim expires at this time, then another worker may take the row. */
    leaseUntil: timestamp('lease_until', { withTimezone: true }),
    providerId: text('provider_id'),
    /** The service's last answer: { status, name, message } or { id }. */
    lastAnswer: jsonb('last_answer'),
    sentAt: timestamp('sent_at', { withTimezone: true }),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    index('mail_queue_due_idx').on(t.state, t.nextAttemptAt),
    // The sender's claims of single messages: the next due one, found at the front of a small index instead of
    // by sorting every queued row (which made each claim cost as much as the whole queue). Batches: mail_batches.
    index('mail_queue_single_due_idx')
      .on(t.nextAttemptAt)
      .where(sql`${t.state} = 'queued' and ${t.batchKey} is null`),
    index('mail_queue_batch_idx').on(t.batchKey),
    index('mail_queue_created_idx').on(t.createdAt),
  ],
);

/**
 * One row per batch key: the sender claims a batch by leasing this row (state `sending`, lease_until), one write
 * for the whole batch, and writes each message once, with its answer. A batch whose worker died is claimed again
 * once its lease has passed and sent under the same key, which the service answers as the first call. Written
 * with the batch's messages (queueMail, the dispatch fan-out), in the same transaction.
 */
export const mailBatches = pgTable(
  'mail_batches',
  {
    key: text('key').primaryKey(),
    state: mailStateEnum('state').notNull().default('queued'),
    attempts: integer('attempts').notNull().default(0),
    nextAttemptAt: timestamp('next_attempt_at', { withTimezone: true }).notNull().defaultNow(),
    leaseUntil: timestamp('lease_until', { withTimezone: true }),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    index('mail_batches_due_idx')
      .on(t.nextAttemptAt)
      .where(sql`${t.state} = 'queued'`),
    index('mail_batches_lease_idx')
      .on(t.leaseUntil)
      .where(sql`${t.state} = 'sending'`),
  ],
);
