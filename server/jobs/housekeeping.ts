import { z } from 'zod';
import { defineQueue, type JobContext } from './queue';

const TASKS = ['tokens', 'rate-limits', 'sessions', 'uploads', 'mail'] as const;

/** Clears what expires: one pass deletes a bounded number of rows per task, so a large backlog takes a few runs. */
export const housekeepingQueue = defineQueue({
  name: 'housekeeping',
  schema: z.object({
    tasks: z
      .array(z.enum(TASKS))
      .min(1)
      .default([...TASKS]),
  }),
  options: { retryLimit: 2, retryDelay: 60, expireInSeconds: 600, policy: 'singleton' },
  // Hourly, at a minute nobody else picks.
  schedule: { cron: '17 * * * *', data: { tasks: [...TASKS] } },
  handler: async ({ tasks }, { ctx }) => runHousekeeping(ctx, tasks),
});

export type HousekeepingResult = Partial<Record<(typeof TASKS)[number], number>>;

const LIMIT = 10_000;

export async function runHousekeeping(ctx: Pick<JobContext, 'pool' | 'config'>, tasks: readonly (typeof TASKS)[number][]) {
  const { pool, config } = ctx;
  const out: HousekeepingResult = {};
  const del = async (sql: string, params: unknown[] = []) => (await pool.query(sql, params)).rowCount ?? 0;
  for (const task of tasks) {
    if (task === 'tokens') {
      // Expired or used sign-up/reset tokens: a day of grace so a "link expired" answer can still find the row.
      out.tokens = await del(
        `delete from auth_tokens where id in (select id from auth_tokens
          where expires_at < now() - interval '1 day' or used_at < now() - interval '1 day' limit ${LIMIT})`,
      );
    } else if (task === 'rate-limits') {
      out['rate-limits'] = await del(
        `delete from rate_limit_hits where key in (select key from rate_limit_hits where reset_at < now() limit ${LIMIT})`,
      );
    } else if (task === 'sessions') {
      out.sessions = await del(`delete from session where sid in (select sid from session where expire < now() limit ${LIMIT})`);
    } else if (task === 'uploads') {
      // Uploads previewed but never imported nor cancelled: release the held text after UPLOAD_HOLD_HOURS.
      out.uploads = await del(
        `update orbit_ingest_jobs set status = 'cancelled', content = null, updated_at = now(),
                message = 'Not imported within ' || $1::int || ' hours, so the held file was released. Upload it again to import it.'
          where id in (select id from orbit_ingest_jobs where status = 'previewed' and updated_at < now() - make_interval(hours => $1::int) limit ${LIMIT})`,
        [config.UPLOAD_HOLD_HOURS],
      );
      // Finished jobs keep their summary, never the text.
      out.uploads += await del(
        `update orbit_ingest_jobs set content = null where content is not null and status in ('imported', 'cancelled', 'failed')`,
      );
    } else if (task === 'mail') {
      // Sent messages are kept for MAIL_QUEUE_KEEP_DAYS (the admin's view of what went out); failed ones stay.
      out.mail = await del(
        `delete from mail_queue where id in (select id from mail_queue where state = 'sent' and sent_at < now() - make_interval(days => $1::int) limit ${LIMIT})`,
        [config.MAIL_QUEUE_KEEP_DAYS],
      );
    }
  }
  return out;
}
