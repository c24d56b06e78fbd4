import { eq, sql } from 'drizzle-orm';
import type pg from 'pg';
import type { Db } from '../../db/client';
import type { Config } from '../../config';
import { excerptOf } from '../../lib/markdown';
import { dispatchEmailSchema } from '../../../emails/templates/dispatch';
import type { DispatchProgress } from '../../../shared/schemas/dispatch';
import { signUnsubscribeToken } from '../my-support/unsubscribe';
import { audienceLine, resolveRecipients } from './audience';
import { dispatches, dispatchSends } from './dispatches.tables';
import { fileUrlPath } from './dispatches.service';
import { dispatchNotFound } from './dispatches.errors';

// E-mailing a dispatch: the fan-out job resolves the audience when it runs and writes one mail-queue row per
// (dispatch, recipient) under the key `dispatch/<dispatch id>/<account id>`, grouped in batches whose key
// `dispatch/<dispatch id>/<n>` is the idempotency key of one batch call; what all copies share is stored once in
// mail_shared (key `dispatch/<dispatch id>`). Rows go in committed chunks under unique keys, so a
// fan-out that dies half-way is run again and writes only the rows still missing; a retry after success writes
// none. The mail sender (server/jobs/mail-sender.ts) sends each batch; progress is counted from the queue.

export const MAIL_QUEUE_NOTIFY_CHANNEL = 'mail_queue';

export const batchKeyOf = (dispatchId: string, n: number) => `dispatch/${dispatchId}/${n}`;
export const mailKeyOf = (dispatchId: string, accountId: string) => `dispatch/${dispatchId}/${accountId}`;
/** The mail_shared row holding what every copy of the dispatch's e-mail has in common. */
export const sharedKeyOf = (dispatchId: string) => `dispatch/${dispatchId}`;

export function unsubscribeUrls(config: Pick<Config, 'PUBLIC_URL' | 'SESSION_SECRET'>, accountId: string) {
  const token = signUnsubscribeToken(config.SESSION_SECRET, accountId, 'dispatches');
  return {
    /** The page a reader opens from the footer: it unsubscribes at once and offers to undo. */
    page: `${config.PUBLIC_URL}/unsubscribe?token=${token}`,
    /** RFC 8058 one-click target: a mail client POSTs "List-Unsubscribe=One-Click" here. */
    oneClick: `${config.PUBLIC_URL}/api/email-choices/unsubscribe?token=${token}`,
  };
}

export function listUnsubscribeHeaders(oneClickUrl: string): Record<string, string> {
  return { 'List-Unsubscribe': `<${oneClickUrl}>`, 'List-Unsubscribe-Post': 'List-Unsubscribe=One-Click' };
}

export function createDispatchSending(deps: { db: Db; pool: pg.Pool; config: Config }) {
  const { db, pool, config } = deps;
  const base = config.PUBLIC_URL.replace(/\/$/, '');

  async function batchKeys(dispatchId: string): Promise<{ keys: string[]; send: typeof dispatchSends.$inferSelect | undefined }> {
    const [send] = await db.select().from(dispatchSends).where(eq(dispatchSends.dispatchId, dispatchId));
    const n = send?.batchCount ?? 0;
    return { keys: Array.from({ length: n }, (_, i) => batchKeyOf(dispatchId, i)), send };
  }

  return {
    /** The fan-out job's work. Safe to run again: it does nothing once the rows exist. */
    async fanOut(dispatchId: string): Promise<{ recipients: number; queued: number }> {
      const [d] = await db.select().from(dispatches).where(eq(dispatches.id, dispatchId));
      if (!d) throw dispatchNotFound();
      const [send] = await db.select().from(dispatchSends).where(eq(dispatchSends.dispatchId, dispatchId));
      if (!send || send.status !== 'pending') return { recipients: send?.recipientCount ?? 0, queued: 0 };
      // A dispatch withdrawn before its fan-out ran is not mailed.
      if (d.state !== 'published') {
        await db
          .update(dispatchSends)
          .set({ status: 'done', recipientCount: 0, batchCount: 0, resolvedAt: new Date() })
          .where(eq(dispatchSends.dispatchId, dispatchId));
        return { recipients: 0, queued: 0 };
      }
      const recipients = await resolveRecipients(db, { kind: d.audienceKind, tierIds: d.audienceTierIds });
      // The shared part of every message, checked once against the template's schema.
      const shared = dispatchEmailSchema.parse({
        title: d.title,
        bodyMarkdown: d.bodyMarkdown,
        excerpt: excerptOf(d.bodyMarkdown),
        pageUrl: `${base}/dispatches/${d.slug}`,
        siteUrl: `${base}/`,
        ...(d.heroImageKey ? { heroImageUrl: `${base}${fileUrlPath(d.heroImageKey)}`, heroAlt: d.heroAlt } : {}),
        charts: d.charts.map((c) => ({ imageUrl: `${base}${fileUrlPath(c.imageKey)}`, alt: c.alt, caption: c.caption, title: c.title })),
        audienceLine: audienceLine(d.audienceKind),
        unsubscribeUrl: `${base}/unsubscribe`,
        choicesUrl: `${base}/my-support/email`,
      });
      // Stored once (mail_shared, written with the first chunk below); each row holds only its own link and names
      // the shared row. A retried fan-out keeps the first one written, which the rows already queued were written against.
      const sharedKey = sharedKeyOf(dispatchId);
      const sharedJson = JSON.stringify(shared);
      const size = config.DISPATCH_BATCH_SIZE;
      // Each member's row, signed links included, made as its chunk is written: the first batch is queued without
      // waiting for the links of every member.
      const rowsOf = (from: number, to: number) =>
        recipients.slice(from, to).map((r, j) => {
          const links = unsubscribeUrls(config, r.accountId);
          return {
            k: mailKeyOf(dispatchId, r.accountId),
            t: r.email,
            d: { unsubscribeUrl: links.page },
            h: listUnsubscribeHeaders(links.oneClick),
            b: batchKeyOf(dispatchId, Math.floor((from + j) / size)),
            a: r.accountId,
          };
        });
      const batchCount = Math.ceil(recipients.length / size);
      let queued = 0;
      // The queue fills in whole batches, each chunk committed and announced on its own, so the sender starts on
      // the first messages while the rest are still being written. A job that runs again (a retry, or a second
      // worker) finds the rows already there: each message's key is unique, so nothing is queued twice.
      // The first chunk is one batch, so the first call goes out at once; chunks then double up to ~2,000 rows.
      const largest = size * Math.max(1, Math.floor(2000 / size));
      for (let i = 0, chunk = size; i < recipients.length; i += chunk, chunk = Math.min(largest, chunk * 2)) {
        // A chunk goes as one JSON parameter (one JSON.stringify here, parsed by Postgres), not as per-column
        // arrays whose every element the driver would escape one by one.
        const json = JSON.stringify(rowsOf(i, i + chunk));
        await db.transaction(async (tx) => {
          // Each batch's own row (the sender's claim and lease of it) goes with its messages, and the shared data
          // with the first chunk (a no-op in the others).
          const r = await tx.execute(sql`
            with x as (select * from json_to_recordset(${json}::json) as x(k text, t text, d jsonb, h jsonb, b text, a uuid)),
                 shared as (insert into mail_shared (key, template, data) select ${sharedKey}, 'dispatch', ${i === 0 ? sharedJson : null}::jsonb
                             where ${i === 0} on conflict (key) do nothing),
                 batches as (insert into mail_batches (key) select distinct b from x on conflict (key) do nothing)
            insert into mail_queue (idempotency_key, template, to_address, data, shared_key, category, headers, batch_key, account_id)
            select k, 'dispatch', t, d, ${sharedKey}, 'dispatch', h, b, a from x
            on conflict (idempotency_key) do nothing`);
          queued += r.rowCount ?? 0;
          await tx.execute(sql`select pg_notify(${MAIL_QUEUE_NOTIFY_CHANNEL}, '')`);
        });
      }
      await db.transaction(async (tx) => {
        const [claimed] = await tx.select().from(dispatchSends).where(eq(dispatchSends.dispatchId, dispatchId)).for('update');
        if (claimed?.status !== 'pending') return;
        await tx
          .update(dispatchSends)
          .set({ status: 'sending', recipientCount: recipients.length, batchCount, resolvedAt: new Date() })
          .where(eq(dispatchSends.dispatchId, dispatchId));
      });
      return { recipients: recipients.length, queued };
    },

    async progress(dispatchId: string): Promise<DispatchProgress> {
      const { keys, send } = await batchKeys(dispatchId);
      if (!send) return { state: 'none', total: 0, queued: 0, sent: 0, failed: 0, failures: [] };
      if (send.status === 'pending') return { state: 'pending', total: 0, queued: 0, sent: 0, failed: 0, failures: [] };
      const counts = await pool.query<{ state: string; n: number }>(
        `select state, count(*)::int as n from mail_queue where batch_key = any($1::text[]) group by state`,
        [keys],
      );
      const by = Object.fromEntries(counts.rows.map((r) => [r.state, r.n])) as Record<string, number>;
      const failures = await pool.query<{
        id: string;
        account_id: string | null;
        to_address: string;
        last_answer: unknown;
        attempts: number;
      }>(
        `select id, account_id, to_address, last_answer, attempts from mail_queue
          where batch_key = any($1::text[]) and state = 'failed' order by to_address limit 200`,
        [keys],
      );
      const queued = (by.queued ?? 0) + (by.sending ?? 0);
      return {
        state: queued === 0 ? 'done' : 'sending',
        total: send.recipientCount ?? 0,
        queued,
        sent: by.sent ?? 0,
        failed: by.failed ?? 0,
        failures: failures.rows.map((f) => {
          const a = (f.last_answer ?? {}) as { status?: number | null; name?: string; message?: string };
          return {
            mailId: f.id,
            recipientId: f.account_id,
            email: f.to_address,
            error: `${a.name ?? 'unknown'}${a.status ? ` (${a.status})` : ''}: ${a.message ?? 'no answer'}`,
            attempts: f.attempts,
          };
        }),
      };
    },

    /**
     * Puts failed messages of this dispatch back in the queue (all, or the given ones), due now. They go out
     * under new batch keys: a batch key names one exact request at the mail service, and a retried subset is
     * a different request.
     */
    async retryFailed(dispatchId: string, mailIds?: Array<string | number>): Promise<number> {
      const size = config.DISPATCH_BATCH_SIZE;
      return db.transaction(async (tx) => {
        const [send] = await tx.select().from(dispatchSends).where(eq(dispatchSends.dispatchId, dispatchId)).for('update');
        const n = send?.batchCount ?? 0;
        if (!send || n === 0) return 0;
        const keys = Array.from({ length: n }, (_, i) => batchKeyOf(dispatchId, i));
        const ids = mailIds ? mailIds.map(String) : null;
        const r = await tx.execute<{ n: number }>(sql`
          with picked as (
            select id, (row_number() over (order by to_address) - 1) as rn from mail_queue
             where batch_key = any(${sql.param(keys)}::text[]) and state = 'failed'
               and (${sql.param(ids)}::text[] is null or id::text = any(${sql.param(ids)}::text[]))),
          retried as (
            update mail_queue m set state = 'queued', attempts = 0, next_attempt_at = now(), lease_until = null, updated_at = now(),
                   batch_key = ${`dispatch/${dispatchId}/`} || (${n}::int + p.rn / ${size}::int)::text
              from picked p where m.id = p.id returning m.batch_key),
          batches as (insert into mail_batches (key) select distinct batch_key from retried on conflict (key) do nothing)
          select count(*)::int as n from retried`);
        const retried = r.rows[0]?.n ?? 0;
        if (retried > 0) {
          await tx
            .update(dispatchSends)
            .set({ batchCount: n + Math.ceil(retried / size) })
            .where(eq(dispatchSends.dispatchId, dispatchId));
          await tx.execute(sql`select pg_notify(${MAIL_QUEUE_NOTIFY_CHANNEL}, '')`);
        }
        return retried;
      });
    },
  };
}

export type DispatchSending = ReturnType<typeof createDispatchSending>;
