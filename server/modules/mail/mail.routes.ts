import { Router } from 'express';
import { z } from 'zod';
import { and, count, desc, eq, sql } from 'drizzle-orm';
import type { Db } from '../../db/client';
import { requireRole } from '../../middleware/auth';
import { validated } from '../../middleware/validate';
import { badRequest, notFound } from '../../errors';
import { recordAudit } from '../audit/audit.repository';
import {
  mailQueueQuerySchema,
  mailStates,
  type MailQueueEntry,
  type MailQueuePage,
  type MailServiceAnswer,
} from '../../../shared/schemas/mail-queue';
import { mailBatches, mailQueue } from './mail.tables';
import { MAIL_QUEUE_CHANNEL } from './mail-queue';

function entryOf(r: typeof mailQueue.$inferSelect): MailQueueEntry {
  return {
    id: r.id,
    template: r.template,
    to: r.toAddress,
    category: r.category,
    state: r.state,
    attempts: r.attempts,
    nextAttemptAt: r.nextAttemptAt.toISOString(),
    providerId: r.providerId,
    answer: (r.lastAnswer as MailServiceAnswer | null) ?? null,
    sentAt: r.sentAt?.toISOString() ?? null,
    createdAt: r.createdAt.toISOString(),
    updatedAt: r.updatedAt.toISOString(),
  };
}

/** Admin's view of the outbox: /api/admin/mail-queue. */
export function createMailQueueRouter({ db }: { db: Db }) {
  const router = Router();
  router.use(requireRole('admin'));

  router.get(
    '/',
    validated({ query: mailQueueQuerySchema }, async (_req, res, { query }) => {
      const where = query.state ? eq(mailQueue.state, query.state) : undefined;
      const rows = await db
        .select()
        .from(mailQueue)
        .where(where)
        .orderBy(desc(mailQueue.createdAt), desc(mailQueue.id))
        .limit(query.pageSize)
        .offset((query.page - 1) * query.pageSize);
      const byState = await db.select({ state: mailQueue.state, n: count() }).from(mailQueue).groupBy(mailQueue.state);
      const counts = Object.fromEntries(mailStates.map((s) => [s, byState.find((b) => b.state === s)?.n ?? 0])) as MailQueuePage['counts'];
      const total = query.state ? counts[query.state] : Object.values(counts).reduce((a, b) => a + b, 0);
      const body: MailQueuePage = { entries: rows.map(entryOf), page: query.page, pageSize: query.pageSize, total, counts };
      res.json(body);
    }),
  );

  // A failed message goes back to the queue (same idempotency key: the service still sends it at most once).
  router.post(
    '/:id/retry',
    validated({ params: z.object({ id: z.uuid({ message: 'must be a mail-queue entry id' }) }) }, async (req, res, { params }) => {
      const entry = await db.transaction(async (tx) => {
        const [row] = await tx.select().from(mailQueue).where(eq(mailQueue.id, params.id));
        if (!row) throw notFound('mail_queue.not_found', 'No such message in the mail queue.');
        if (row.state !== 'failed')
          throw badRequest('mail_queue.not_failed', `Only a failed message can be retried; this one is ${row.state}.`);
        const [updated] = await tx
          .update(mailQueue)
          .set({ state: 'queued', attempts: 0, nextAttemptAt: new Date(), updatedAt: new Date() })
          .where(and(eq(mailQueue.id, row.id), eq(mailQueue.state, 'failed')))
          .returning();
        // A batch message is sent through its batch's row, which is due again with it.
        if (row.batchKey)
          await tx
            .insert(mailBatches)
            .values({ key: row.batchKey })
            .onConflictDoUpdate({
              target: mailBatches.key,
              set: { state: 'queued', attempts: 0, nextAttemptAt: new Date(), leaseUntil: null, updatedAt: new Date() },
            });
        await recordAudit(tx, {
          actorId: req.user!.id,
          action: 'mail_queue.retried',
          subjectType: 'mail_queue',
          subjectId: row.id,
          before: { state: 'failed' },
          after: { state: 'queued' },
        });
        await tx.execute(sql`select pg_notify(${MAIL_QUEUE_CHANNEL}, '')`);
        return updated!;
      });
      res.json({ entry: entryOf(entry) });
    }),
  );
  return router;
}
