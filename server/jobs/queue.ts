import type PgBoss from 'pg-boss';
import type { z } from 'zod';
import type pg from 'pg';
import type { Logger } from 'pino';
import type { Db } from '../db/client';
import type { Config } from '../config';

/** What a job handler gets: the process's shared dependencies (one per worker process). */
export type JobContext = {
  db: Db;
  pool: pg.Pool;
  config: Config;
  logger: Logger;
  /** Enqueue follow-up work from a handler. */
  jobs: JobSender;
  /** Extra dependencies a queue may need (tests inject clients here); see CreateJobsOptions.deps. */
  deps: Record<string, unknown>;
};

export type SendOptions = PgBoss.SendOptions;

/** The only thing a web process needs: put work on a queue. */
export interface JobSender {
  send(queue: string, payload: unknown, options?: SendOptions): Promise<string | null>;
}

/**
 * One queue: its name, its payload schema (checked when sent and again when worked), its pg-boss options
 * (retries, expiry, policy), optional cron schedules, and the handler that does one job.
 * A handler must be idempotent (a unique key per effect): pg-boss may hand a job out again after a crash.
 */
export type QueueDefinition<S extends z.ZodType = z.ZodType> = {
  name: string;
  schema: S;
  /** Fixed, or read from the config (e.g. an expiry a deployment tunes). */
  options?: Omit<PgBoss.Queue, 'name'> | ((config: Config) => Omit<PgBoss.Queue, 'name'>);
  /** How often an idle worker polls (seconds, ≥ 0.5) and how many jobs it may run at once in this process. */
  work?: { pollingIntervalSeconds?: number; concurrency?: number };
  /** A cron schedule (UTC; pg-boss keeps one per queue, so every worker may declare it — it fires once). */
  schedule?: { cron: string; data: z.input<S> };
  handler: (payload: z.output<S>, meta: { id: string; ctx: JobContext; retryCount: number }) => Promise<unknown>;
};

export function queueOptions(q: Pick<QueueDefinition, 'options'>, config: Config): Omit<PgBoss.Queue, 'name'> | undefined {
  return typeof q.options === 'function' ? q.options(config) : q.options;
}

/** How many running workers of this process work each queue (set by createJobs' work() and stop()). */
const workedHere = new Map<string, number>();

/** Counts this process's workers of `queue` in (+1) or out (−1). */
export function countWorkerHere(queue: string, delta: 1 | -1): void {
  const n = (workedHere.get(queue) ?? 0) + delta;
  if (n > 0) workedHere.set(queue, n);
  else workedHere.delete(queue);
}

/** Whether a worker in this process takes jobs of `queue`: a job sent now may well run here, next to its sender. */
export function isWorkedHere(queue: string): boolean {
  return (workedHere.get(queue) ?? 0) > 0;
}

export function defineQueue<S extends z.ZodType>(q: QueueDefinition<S>): QueueDefinition<S> {
  return q;
}
