import pino from 'pino';
import { createApp } from '../../server/app';
import { createMailerFromConfig, createStripeFromConfig } from '../../server/deps';
import { createJobs, type Jobs, type QueueDefinition } from '../../server/jobs';
import { dispatchFanOutQueue } from '../../server/jobs/dispatch-fan-out';
import { dispatchPublishQueue } from '../../server/jobs/dispatch-publish';
import { createDb } from '../../server/db/client';
import type { TestApp } from '../setup/test-app';

export const dispatchQueues = [dispatchPublishQueue as QueueDefinition, dispatchFanOutQueue as QueueDefinition];

/** A worker "process" on the test database: its own pool and pg-boss, running the dispatch queues. */
export async function startWorker(t: TestApp, queues: QueueDefinition[] = dispatchQueues, deps: Record<string, unknown> = {}) {
  const { db, pool } = createDb(t.database.url, { max: 6 });
  const jobs = createJobs({ pool, db, config: t.config, logger: pino({ level: 'silent' }), queues, worker: true, deps });
  await jobs.start();
  await jobs.work();
  return {
    jobs,
    stop: async () => {
      await jobs.stop();
      await pool.end();
    },
  };
}

/** The web app with a job sender (what server/index.ts builds). */
export async function appWithJobs(t: TestApp, queues: QueueDefinition[] = dispatchQueues) {
  const jobs: Jobs = createJobs({ pool: t.database.pool, db: t.database.db, config: t.config, logger: pino({ level: 'silent' }), queues });
  await jobs.start();
  const app = createApp({
    db: t.database.db,
    pool: t.database.pool,
    config: t.config,
    mailer: createMailerFromConfig(t.config),
    stripe: createStripeFromConfig(t.config),
    jobs,
  });
  return { app, jobs };
}

export async function waitFor<T>(check: () => Promise<T | false | null | undefined>, ms = 30_000, every = 200): Promise<T> {
  const until = Date.now() + ms;
  for (;;) {
    const v = await check();
    if (v) return v;
    if (Date.now() > until) throw new Error('timed out waiting');
    await new Promise((r) => setTimeout(r, every));
  }
}
