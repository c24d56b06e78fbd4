import { sql } from 'drizzle-orm';
import type { Db } from '../../db/client';
import { emailDataSchemas, type EmailData, type EmailName } from '../../../emails/templates';
import { mailBatches, mailQueue, type MailAttachmentRef } from './mail.tables';

/** A database handle or an open transaction: queueMail must be called with the transaction of the causing change. */
export type DbOrTx = Pick<Db, 'insert' | 'execute'>;

export type MailCategory = 'transactional' | 'dispatch';

export type QueueMailInput<N extends EmailName = EmailName> = {
  template: N;
  to: string;
  data: EmailData[N];
  category: MailCategory;
  /** Unique per effect (e.g. `pledge-confirmation/<pledge id>`): queueing the same key again is a no-op. */
  idempotencyKey: string;
  headers?: Record<string, string>;
  accountId?: string | null;
  /**
   * Rows sharing a batch key go out in one batch call (at most 100; see the mail sender). A batch key names one
   * call: queue all of its rows before it is sent (a row added to a batch already sent is not sent).
   */
  batchKey?: string | null;
  /** Files rendered and attached when the message is sent (single messages only: the batch call takes none). */
  attachments?: MailAttachmentRef[];
};

/** The channel the mail sender listens on; NOTIFY is delivered only when the transaction commits. */
export const MAIL_QUEUE_CHANNEL = 'mail_queue';

export class MailQueueDataError extends Error {
  constructor(
    readonly template: string,
    readonly issues: Array<{ path: string; message: string }>,
  ) {
    super(`invalid data for e-mail "${template}": ${issues.map((i) => `${i.path}: ${i.message}`).join('; ')}`);
    this.name = 'MailQueueDataError';
  }
}

/**
 * Writes one message to the outbox (mail_queue) inside the caller's transaction: it leaves with the change
 * that causes it, or not at all. The data is checked against the template's schema now, so a message that could
 * never render fails the causing request instead of sitting in the queue. Returns whether a row was added.
 */
export async function queueMail<N extends EmailName>(tx: DbOrTx, input: QueueMailInput<N>): Promise<boolean> {
  if (input.batchKey && input.attachments?.length)
    throw new MailQueueDataError(input.template, [{ path: 'attachments', message: 'a batch message cannot carry attachments' }]);
  const parsed = emailDataSchemas[input.template].safeParse(input.data);
  if (!parsed.success) {
    throw new MailQueueDataError(
      input.template,
      parsed.error.issues.map((i) => ({ path: i.path.join('.') || '(data)', message: i.message })),
    );
  }
  const rows = await tx
    .insert(mailQueue)
    .values({
      idempotencyKey: input.idempotencyKey,
      template: input.template,
      toAddress: input.to,
      data: input.data,
      category: input.category,
      headers: input.headers ?? {},
      accountId: input.accountId ?? null,
      batchKey: input.batchKey ?? null,
      attachments: input.attachments ?? [],
    })
    .onConflictDoNothing({ target: mailQueue.idempotencyKey })
    .returning({ id: mailQueue.id });
  // The batch's own row, which the sender claims and leases for all its messages (one per batch key).
  if (rows.length && input.batchKey)
    await tx.insert(mailBatches).values({ key: input.batchKey }).onConflictDoNothing({ target: mailBatches.key });
  if (rows.length) await tx.execute(sql`select pg_notify(${MAIL_QUEUE_CHANNEL}, '')`);
  return rows.length > 0;
}
