import { z } from 'zod';
import { defineQueue, type JobContext } from './queue';
import { createLocalDiskStorage, type FileStorage } from '../lib/storage';

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
  handler: async ({ tasks }, { ctx }) =>
    runHousekeeping(
      { ...ctx, storage: (ctx.deps.storage as FileStorage | undefined) ?? createLocalDiskStorage(ctx.config.UPLOADS_DIR) },
      tasks,
    ),
});

export type HousekeepingResult = Partial<Record<(typeof TASKS)[number], number>>;

const LIMIT = 10_000;

/** Stored images looked at per pass: each orphan costs a row delete and a file removal. */
const FILE_LIMIT = 500;

export async function runHousekeeping(
  ctx: Pick<JobContext, 'pool' | 'config'> & { storage?: FileStorage },
  tasks: readonly (typeof TASKS)[number][],
) {
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
      if (ctx.storage) out.uploads += await removeOrphanedFiles(pool, ctx.storage, config.ORPHAN_FILE_HOURS);
    } else if (task === 'mail') {
      // Sent messages are kept for MAIL_QUEUE_KEEP_DAYS (the admin's view of what went out); failed ones stay.
      out.mail = await del(
        `delete from mail_queue where id in (select id from mail_queue where state = 'sent' and sent_at < now() - make_interval(days => $1::int) limit ${LIMIT})`,
        [config.MAIL_QUEUE_KEEP_DAYS],
      );
      // Batch rows whose call is over (their messages keep their own state and answer).
      out.mail += await del(
        `delete from mail_batches where key in (select key from mail_batches
          where state in ('sent', 'failed') and updated_at < now() - make_interval(days => $1::int) limit ${LIMIT})`,
        [config.MAIL_QUEUE_KEEP_DAYS],
      );
      // Shared mail data that no message names any more (its copies were deleted above). A day of grace: a fan-out
      // writes its shared row first and its messages in the moments after.
      out.mail += await del(
        `delete from mail_shared s where s.created_at < now() - interval '1 day'
            and not exists (select 1 from mail_queue m where m.shared_key = s.key)`,
      );
    }
  }
  return out;
}

/**
 * Dispatch images (hero uploads, frozen chart PNGs) that no dispatch and no published version uses, older than
 * `hours`: replaced heroes, charts frozen for a save that failed or was edited away before publishing. The row goes
 * first (under the same "still unused" check), then the bytes; a failed removal leaves only unlisted bytes behind.
 */
async function removeOrphanedFiles(pool: JobContext['pool'], storage: FileStorage, hours: number) {
  const { rows } = await pool.query<{ key: string }>(
    `delete from stored_files f where f.key in (
        select s.key from stored_files s
         where s.purpose in ('dispatch-hero', 'dispatch-chart') and s.created_at < now() - make_interval(hours => $1::int)
           and not exists (select 1 from dispatches d where d.hero_image_key = s.key
                              or d.charts @> jsonb_build_array(jsonb_build_object('imageKey', s.key)))
           and not exists (select 1 from dispatch_versions v where v.hero_image_key = s.key
                              or v.charts @> jsonb_build_array(jsonb_build_object('imageKey', s.key)))
         limit ${FILE_LIMIT})
      returning f.key`,
    [hours],
  );
  for (const { key } of rows) await storage.remove(key);
  return rows.length;
}
