// Reconciliation runs through real workers: a worker process polling pg-boss, a worker process killed mid-run
// (SIGKILL, as a crash or an out-of-memory kill would), and one open run per range of days.
import type { ChildProcess } from 'node:child_process';
import { afterEach, describe, expect, it } from 'vitest';
import { CARDS, payOnHostedPage, paidPledge, settle, startPledge } from '../api/pledges-fixtures';
import { brief, createBooksWorld, type BooksWorld } from '../api/books-fixtures';
import { startWorker, waitFor } from '../api/dispatches-jobs-helpers';
import { spawnWorkerProcess } from '../setup/worker-process';
import { booksReconcileGaveUpQueue, booksReconcileQueue } from '../../server/jobs/books-reconcile';
import type { QueueDefinition } from '../../server/jobs';

const reconQueues = [booksReconcileQueue as QueueDefinition, booksReconcileGaveUpQueue as QueueDefinition];
const day = (offsetDays: number) => new Date(Date.now() + offsetDays * 86_400_000).toISOString().slice(0, 10);
const range = { from: day(-2), to: day(20) };
const DAYS = 23;

// Short expiry and a fast supervisor, so a dead worker's job is handed out again within seconds.
const ENV = { RECON_JOB_EXPIRE_SECONDS: '4', JOB_MAINTENANCE_INTERVAL_SECONDS: '1' };

let w: BooksWorld | undefined;
const stops: Array<() => Promise<void>> = [];
const children: ChildProcess[] = [];
afterEach(async () => {
  for (const c of children.splice(0)) if (c.exitCode === null && c.signalCode === null) c.kill('SIGKILL');
  for (const s of stops.splice(0)) await s().catch(() => undefined);
  await w?.close();
  w = undefined;
});

type RunView = {
  id: string;
  status: string;
  stepsDone: number;
  stepsTotal: number;
  fetchedCount: number;
  attempts: number;
  summary: { fetched: number; matched: number } | null;
};

async function getRun(world: BooksWorld, id: string) {
  const res = await world.finance.get(`/api/books/reconciliations/${id}`);
  expect(res.status).toBe(200);
  return res.body as { run: RunView; findings: Parameters<typeof brief>[0] };
}

async function startRun(world: BooksWorld, body = range) {
  return world.finance.post('/api/books/reconciliations').set('x-csrf-token', world.finance.csrf).send(body);
}

/** Two paid pledges and one whose webhook never arrived: one finding "at the processor, not in the ledger". */
async function someMoney(world: BooksWorld) {
  await paidPledge(world, world.backer, { tierId: world.tier.patch.id, amountMinor: 2500 });
  await paidPledge(world, world.backer, { tierId: world.tier.patch.id, amountMinor: 4000 });
  world.fake.faults.set({ dropWebhooks: true });
  const res = await startPledge(world.backer, { tierId: world.tier.patch.id, amountMinor: 3100 });
  expect((await payOnHostedPage(res.body.checkoutUrl, CARDS.ok)).status).toBe(303);
  world.fake.faults.set({ dropWebhooks: false });
  await settle(world);
  const missed = (await world.stripe.charges.list({ limit: 1 })).data[0]!.id;
  return { missed };
}

/** `npm run worker` as its own process, on the world's database and fakes. */
async function spawnWorker(world: BooksWorld) {
  const child = await spawnWorkerProcess(world.t.config, ENV);
  children.push(child);
  return child;
}

describe('reconciliation runs on workers', () => {
  it('a worker runs a started run and stores its progress day by day, then the findings', async () => {
    w = await createBooksWorld(ENV);
    const { missed } = await someMoney(w);
    const worker = await startWorker(w.t, reconQueues);
    stops.push(worker.stop);
    w.fake.faults.set({ latencyMs: 60 });

    const started = await startRun(w);
    expect(started.status, JSON.stringify(started.body)).toBe(202);
    expect(started.body.run).toMatchObject({ status: 'queued', stepsDone: 0, stepsTotal: DAYS + 2 });
    const seen: Array<[number, number, string]> = [];
    const finished = await waitFor(
      async () => {
        const { run } = await getRun(w!, started.body.run.id);
        seen.push([run.stepsDone, run.stepsTotal, run.status]);
        return run.status === 'done' || run.status === 'failed' ? run : null;
      },
      60_000,
      100,
    );
    expect(finished.status).toBe('done');
    // Progress only moves forward, was seen between the ends, and ends at total of total.
    const done = seen.map((s) => s[0]);
    expect(done).toEqual([...done].sort((a, b) => a - b));
    expect(seen.some(([d, t, st]) => st === 'running' && d > 0 && d < t)).toBe(true);
    expect(seen.every(([, t]) => t === DAYS + 2)).toBe(true);
    expect(finished).toMatchObject({ stepsDone: DAYS + 2, stepsTotal: DAYS + 2, fetchedCount: 3, attempts: 1 });
    expect(finished.summary).toMatchObject({ fetched: 3, matched: 2 });
    const { findings } = await getRun(w, started.body.run.id);
    expect(brief(findings)).toEqual([{ kind: 'missing_in_ledger', object: missed, processor: 3100, ledger: null, currency: 'USD' }]);
  }, 180_000);

  it('a worker killed mid-run: the job is handed out again, the run resumes, and the findings are not doubled', async () => {
    w = await createBooksWorld(ENV);
    const { missed } = await someMoney(w);
    const child = await spawnWorker(w);
    w.fake.faults.set({ latencyMs: 400 });
    const started = await startRun(w);
    expect(started.status, JSON.stringify(started.body)).toBe(202);
    const runId = started.body.run.id as string;
    const atKill = await waitFor(
      async () => {
        const { run } = await getRun(w!, runId);
        return run.status === 'running' && run.stepsDone >= 2 ? run : null;
      },
      90_000,
      100,
    );
    child.kill('SIGKILL');
    await new Promise((r) => child.once('exit', r));
    w.fake.faults.set({ latencyMs: 0 });
    expect(atKill.stepsDone).toBeLessThan(DAYS);
    const { rows: active } = await w.t.database.pool.query<{ state: string }>(
      `select state from pgboss.job where name = 'books-reconcile' and data->>'runId' = $1`,
      [runId],
    );
    expect(active.map((r) => r.state)).toEqual(['active']);

    const worker = await startWorker(w.t, reconQueues);
    stops.push(worker.stop);
    const finished = await waitFor(async () => {
      const { run } = await getRun(w!, runId);
      return run.status === 'done' || run.status === 'failed' ? run : null;
    }, 60_000);
    expect(finished.status).toBe('done');
    expect(finished.attempts).toBe(2);
    expect(finished.summary).toMatchObject({ fetched: 3, matched: 2 });
    const { findings } = await getRun(w, runId);
    expect(brief(findings)).toEqual([{ kind: 'missing_in_ledger', object: missed, processor: 3100, ledger: null, currency: 'USD' }]);
    const { rows: counts } = await w.t.database.pool.query<{ n: number }>(
      'select count(*)::int as n from recon_findings where run_id = $1',
      [runId],
    );
    expect(counts[0]!.n).toBe(1);
    const { rows: job } = await w.t.database.pool.query<{ state: string; retry_count: number }>(
      `select state, retry_count from pgboss.job where name = 'books-reconcile' and data->>'runId' = $1`,
      [runId],
    );
    expect(job).toEqual([{ state: 'completed', retry_count: 1 }]);
  }, 240_000);

  it('one open run per range of days: an overlapping start is refused until the first has finished', async () => {
    w = await createBooksWorld(ENV);
    const first = await startRun(w, { from: day(-2), to: day(3) });
    expect(first.status).toBe(202);
    const overlapping = await startRun(w, { from: day(3), to: day(10) });
    expect(overlapping.status).toBe(409);
    expect(overlapping.body.error.code).toBe('books.run_in_progress');
    const apart = await startRun(w, { from: day(4), to: day(10) });
    expect(apart.status).toBe(202);
    // Nothing half-written by the refused start: two runs and two jobs.
    const { rows } = await w.t.database.pool.query<{ runs: number; jobs: number }>(
      `select (select count(*)::int from recon_runs) as runs,
              (select count(*)::int from pgboss.job where name = 'books-reconcile') as jobs`,
    );
    expect(rows[0]).toEqual({ runs: 2, jobs: 2 });
    expect(await w.t.jobs.runPending('books-reconcile')).toBe(2);
    expect((await getRun(w, first.body.run.id)).run.status).toBe('done');
    const again = await startRun(w, { from: day(3), to: day(10) });
    expect(again.status).toBe(202);
  }, 120_000);
});
