/**
 * Background work: pg-boss queues and their workers, in one place.
 *
 *   const jobs = createJobs({ pool, db, config, logger, deps, worker: true|false });
 *   await jobs.start();              // every process: connects, creates the queues (idempotent)
 *   await jobs.send('housekeeping', { task: 'tokens' }, { singletonKey: 'x' });   // any process, e.g. a route
 *   await jobs.work();               // worker processes only: registers every queue's workers and schedules
 *   await jobs.stop();               // stops fetching, waits for running jobs (up to JOBS_SHUTDOWN_TIMEOUT_MS)
 *
 * Each queue is one file in server/jobs/ (see queue.ts): name, zod payload schema (checked on send and on
 * work), retries/expiry, optional cron schedule, handler. List a new queue in `queues` below.
 * A job whose process dies stays `active` until its expiry, then pg-boss's supervisor (run by any worker)
 * hands it out again while retries remain: handlers are idempotent. `npm start` runs the web app and one
 * worker process (server/worker.ts); `npm run worker` runs workers alone, any number, on the same database.
 * The web app gets only a JobSender (`send`); `createApp({ …, jobs })`.
 *
 * Mail is not a pg-boss job per message: rows in mail_queue are the outbox (server/modules/mail/mail-queue.ts:
 * queueMail(tx, …) inside the causing transaction); work() also starts the mail sender (mail-sender.ts).
 */
import PgBoss from 'pg-boss';
import pg from 'pg';
import type { Logger } from 'pino';
import type { Db } from '../db/client';
import type { Config } from '../config';
import type { JobContext, JobSender, QueueDefinition } from './queue';
import { housekeepingQueue } from './housekeeping';
import { accountMailQueue } from './account-mail';
import { dispatchPublishQueue } from './dispatch-publish';
import { dispatchFanOutQueue } from './dispatch-fan-out';
import { booksReconcileGaveUpQueue, booksReconcileQueue } from './books-reconcile';
import { passRemindersQueue } from './pass-reminders';
import { createMailSender, mailSenderOptionsFrom } from './mail-sender';
import { createPgListener } from '../lib/pg-listen';
import { withSessionLock } from '../lib/session-lock';
import { countWorkerHere, queueOptions } from './queue';
import { elementSetIngestQueue, elementSetIngestFailedQueue } from './element-set-ingest';

export type { JobContext, JobSender, QueueDefinition, SendOptions } from './queue';
export { defineQueue } from './queue';

// Every queue the product has. Order does not matter (a dead-letter queue is created before the queue naming it).
export const queues: QueueDefinition[] = [
  housekeepingQueue,
  accountMailQueue,
  dispatchPublishQueue,
  dispatchFanOutQueue,
  booksReconcileQueue,
  booksReconcileGaveUpQueue,
  elementSetIngestQueue as QueueDefinition,
  elementSetIngestFailedQueue as QueueDefinition,
  passRemindersQueue,
];

/**
 * The channel a sender NOTIFYs (inside its transaction, so only once the job is committed) with the queue's name:
 * idle workers of that queue fetch at once instead of at their next poll. Polling stays the fallback.
 */
export const WAKE_CHANNEL = 'lightkeel_jobs';

/** The advisory lock under which one process at a time creates or updates the queues. */
const QUEUE_SETUP_LOCK = 'lightkeel:job-queue-setup';

/** pg-boss's own schema; its tables live beside ours in the same database. */
export const JOBS_SCHEMA = 'pgboss';

export type CreateJobsOptions = {
  pool: pg.Pool;
  db: Db;
  config: Config;
  logger: Logger;
  /** Extra dependencies handed to handlers as ctx.deps (tests inject clients and switches here). */
  deps?: Record<string, unknown>;
  /** Queues to know (default: all). */
  queues?: QueueDefinition[];
  /** Run the mail sender loop in work() (default true). */
  mailSender?: boolean;
  /** This process runs workers: pg-boss's supervisor (expiry → retry, retention) and cron clock run here too. */
  worker?: boolean;
};

export type Jobs = JobSender & {
  boss: PgBoss;
  start(): Promise<void>;
  /** Registers the workers and schedules; returns when they are polling. */
  work(): Promise<void>;
  /** Graceful: stop fetching, wait for running jobs (bounded), release nothing it does not own. */
  stop(): Promise<void>;
  /** Runs the jobs waiting now in this process, one by one, until none is left (tests; a one-off script). */
  runPending(queue?: string): Promise<number>;
  /** Background loops started by work() (e.g. the mail sender) that stop() must also wait for. */
  addLoop(loop: { stop: () => Promise<void> }): void;
};

/** pg-boss over our pool (no second pool per process): it runs plain parameterised SQL. */
function bossDb(pool: pg.Pool): PgBoss.Db {
  return { executeSql: (text, values) => pool.query(text, values) };
}

/**
 * bossDb that also keeps the queries still running: pg-boss's stop() does not wait for a claim still on its way
 * (its job is handed to the handler afterwards), nor for the completion it sends without awaiting. stop() below
 * waits for both, so the pool can end right after it.
 */
function trackedBossDb(pool: pg.Pool) {
  const running = new Set<Promise<unknown>>();
  const db: PgBoss.Db = {
    executeSql: (text, values) => {
      const query = pool.query(text, values);
      running.add(query);
      query.then(
        () => running.delete(query),
        () => running.delete(query),
      );
      return query;
    },
  };
  return { db, running };
}

export function bossOptions(config: Config): PgBoss.ConstructorOptions {
  return {
    schema: JOBS_SCHEMA,
    // Old job rows: completed jobs move to the archive after this, and archived ones are deleted after
    // JOB_RETENTION_DAYS (pg-boss's own maintenance, run by the supervisor in worker processes).
    archiveCompletedAfterSeconds: config.JOB_ARCHIVE_AFTER_SECONDS,
    archiveFailedAfterSeconds: config.JOB_ARCHIVE_AFTER_SECONDS,
    deleteAfterDays: config.JOB_RETENTION_DAYS,
    maintenanceIntervalSeconds: config.JOB_MAINTENANCE_INTERVAL_SECONDS,
  };
}

export function createJobs(opts: CreateJobsOptions): Jobs {
  const { pool, db, config, logger } = opts;
  const list = opts.queues ?? queues;
  const byName = new Map(list.map((q) => [q.name, q]));
  const log = logger.child({ part: 'jobs' });
  let working = false;
  const loops: Array<{ stop: () => Promise<void> }> = [];
  /** The queues work() registered workers for here, once per worker (stop() counts them out again). */
  const countedHere: string[] = [];

  const bossSql = trackedBossDb(pool);
  const boss = new PgBoss({
    ...bossOptions(config),
    db: bossSql.db,
    // Web processes only send: the supervisor (expiry, retention) and the cron clock run in workers.
    supervise: opts.worker === true,
    schedule: opts.worker === true,
  });
  boss.on('error', (err) => log.error({ err }, 'job system error'));

  const sender: JobSender = {
    async send(queue, payload, options) {
      const q = byName.get(queue);
      if (!q) throw new Error(`unknown queue "${queue}"`);
      const data = q.schema.parse(payload) as object;
      const id = await boss.send(queue, data, options ?? {});
      if (id) await (options?.db ?? bossDb(pool)).executeSql('select pg_notify($1, $2)', [WAKE_CHANNEL, queue]);
      return id;
    },
  };

  const ctx: JobContext = { db, pool, config, logger: log, jobs: sender, deps: opts.deps ?? {} };

  async function start() {
    await boss.start();
    // A dead-letter queue must exist before the queue that names it: those without one go first.
    const ordered = [...list].sort(
      (a, b) => Number(Boolean(queueOptions(a, config)?.deadLetter)) - Number(Boolean(queueOptions(b, config)?.deadLetter)),
    );
    // pg-boss gives each queue a table of its own; processes creating queues at the same moment (the web app and its
    // worker on a fresh database) deadlock on those tables. One process at a time sets the queues up, under a
    // session lock held on a connection of its own (the statements themselves run on the pool).
    await withSessionLock(pool.options, QUEUE_SETUP_LOCK, async () => {
      for (const q of ordered) {
        const options = queueOptions(q, config);
        const existing = await boss.getQueue(q.name);
        if (!existing) await boss.createQueue(q.name, { name: q.name, ...options });
        else if (options) await boss.updateQueue(q.name, { name: q.name, ...options });
      }
    });
  }

  async function work() {
    if (!opts.worker) throw new Error('createJobs({ worker: true }) is needed to run workers');
    if (working) return;
    working = true;
    const workerIds = new Map<string, string[]>();
    for (const q of list) {
      const concurrency = q.work?.concurrency ?? 1;
      for (let i = 0; i < concurrency; i++) {
        const workerId = await boss.work<unknown>(
          q.name,
          { batchSize: 1, includeMetadata: true, pollingIntervalSeconds: q.work?.pollingIntervalSeconds ?? 2 },
          async (batch) => {
            for (const job of batch) {
              const parsed = q.schema.safeParse(job.data);
              if (!parsed.success) {
                // A payload no handler can use is not retried: it fails at once, with the reason stored.
                log.error({ queue: q.name, jobId: job.id, issues: parsed.error.issues }, 'job payload refused');
                throw new Error(`payload refused: ${parsed.error.issues.map((i) => `${i.path.join('.')}: ${i.message}`).join('; ')}`);
              }
              const started = Date.now();
              const run = q.handler(parsed.data, { id: job.id, ctx, retryCount: job.retryCount });
              inFlight.add(run);
              try {
                await run;
                log.debug({ queue: q.name, jobId: job.id, ms: Date.now() - started }, 'job done');
              } catch (err) {
                log.warn({ err, queue: q.name, jobId: job.id, retryCount: job.retryCount }, 'job failed');
                throw err;
              } finally {
                inFlight.delete(run);
              }
            }
          },
        );
        workerIds.set(q.name, [...(workerIds.get(q.name) ?? []), workerId]);
        countWorkerHere(q.name, 1);
        countedHere.push(q.name);
      }
      if (q.schedule) await boss.schedule(q.name, q.schedule.cron, q.schema.parse(q.schedule.data) as object, { tz: 'UTC' });
    }
    // Idle workers of a queue fetch as soon as a job is sent to it; polling stays the fallback.
    const wake = createPgListener({
      pool,
      channel: WAKE_CHANNEL,
      log,
      what: 'job wake-up listener (workers poll meanwhile)',
      onMessage: (queue) => {
        for (const id of workerIds.get(queue) ?? []) boss.notifyWorker(id);
      },
    });
    await wake.start();
    loops.push(wake);
    if (opts.mailSender !== false) {
      const sender = createMailSender(pool, mailSenderOptionsFrom(ctx), log.child({ part: 'mail' }));
      await sender.start();
      loops.push(sender);
    }
  }

  async function runOne(q: QueueDefinition, job: { id: string; data: unknown; retryCount?: number }) {
    const parsed = q.schema.safeParse(job.data);
    if (!parsed.success)
      throw new Error(`payload refused: ${parsed.error.issues.map((i) => `${i.path.join('.')}: ${i.message}`).join('; ')}`);
    await q.handler(parsed.data, { id: job.id, ctx, retryCount: job.retryCount ?? 0 });
  }

  async function runPending(queue?: string) {
    let n = 0;
    for (const q of list) {
      if (queue && q.name !== queue) continue;
      for (;;) {
        const [job] = await boss.fetch<unknown>(q.name);
        if (!job) break;
        try {
          await runOne(q, job);
          await boss.complete(q.name, job.id);
        } catch (err) {
          await boss.fail(q.name, job.id, { message: (err as Error).message });
          throw err;
        }
        n++;
      }
    }
    return n;
  }

  const inFlight = new Set<Promise<unknown>>();

  async function stop() {
    const timeout = config.JOBS_SHUTDOWN_TIMEOUT_MS;
    const until = Date.now() + timeout;
    for (const name of countedHere.splice(0)) countWorkerHere(name, -1);
    await Promise.all(loops.map((l) => l.stop().catch((err: unknown) => log.error({ err }, 'loop stop failed'))));
    // graceful + wait: resolves once the running jobs have finished (or the timeout failed them for a retry).
    await boss.stop({ graceful: true, wait: true, timeout, close: false });
    // pg-boss resolves once no worker holds a job, but a claim still on its way hands its job to a handler later,
    // and completions are sent without being awaited: wait, bounded as above, until no pg-boss query and no
    // handler of ours is left. A turn of the event loop between checks lets a returned claim reach its handler.
    for (;;) {
      await new Promise((resolve) => setImmediate(resolve));
      const pending = [...bossSql.running, ...inFlight];
      const left = until - Date.now();
      if (pending.length === 0) break;
      if (left <= 0) {
        log.warn({ pending: pending.length }, 'jobs still running at the shutdown timeout');
        break;
      }
      let timer: ReturnType<typeof setTimeout> | undefined;
      await Promise.race([Promise.allSettled(pending), new Promise((resolve) => (timer = setTimeout(resolve, left)))]);
      clearTimeout(timer);
    }
  }

  return { boss, send: sender.send, start, work, stop, runPending, addLoop: (l) => void loops.push(l) };
}
