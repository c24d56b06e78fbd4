import type { ChildProcess } from 'node:child_process';
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest';
import pg from 'pg';
import { createApp } from '../../server/app';
import { createMailerFromConfig, createStripeFromConfig } from '../../server/deps';
import { DEMO_PASSWORD } from '../../server/demo/accounts';
import { agentFor, signIn, type Agent, type TestApp } from '../setup/test-app';
import { spawnWorkerProcess } from '../setup/worker-process';
import { countRows, orbitDesk, startIngestWorker, tern1Set, tleLines, upload, type UploadBody } from './orbit-helpers';

// Element-set preview and import run on pg-boss workers (server/jobs/element-set-ingest.ts). These tests drive the
// HTTP API while real workers — in this process, and `npm run worker` as a child process — do the work.

let t: TestApp;
let engineer: Agent;
let craftId: string;
let child: ChildProcess | undefined;
const workers: Array<Awaited<ReturnType<typeof startIngestWorker>>> = [];

beforeAll(async () => {
  // A short expiry and a fast supervisor, so a job lost with its worker comes back within seconds.
  ({
    t,
    engineer,
    spacecraftId: craftId,
  } = await orbitDesk(
    { INGEST_JOB_EXPIRE_SECONDS: '3', JOB_MAINTENANCE_INTERVAL_SECONDS: '1', JOBS_SHUTDOWN_TIMEOUT_MS: '5000' },
    { worker: false },
  ));
}, 180_000);
afterEach(async () => {
  for (const w of workers.splice(0)) await w.stop();
});
afterAll(async () => {
  child?.kill('SIGKILL');
  await t.close();
});

async function worker() {
  const w = await startIngestWorker(t);
  workers.push(w);
  return w;
}

/** `npm run worker` as a real child process on the test database. */
const spawnWorker = () => spawnWorkerProcess(t.config);

async function getUpload(id: string): Promise<UploadBody> {
  return (await engineer.get(`/api/orbit/uploads/${id}`).expect(200)).body.upload as UploadBody;
}

async function until<T>(check: () => Promise<T | false | null | undefined>, ms = 240_000, every = 50): Promise<T> {
  const end = Date.now() + ms;
  for (;;) {
    const v = await check();
    if (v) return v;
    if (Date.now() > end) throw new Error('timed out waiting');
    await new Promise((r) => setTimeout(r, every));
  }
}

const settled = (id: string) =>
  until(async () => {
    const u = await getUpload(id);
    return u.status !== 'parsing' && u.status !== 'importing' ? u : null;
  });

/** `n` distinct Tern-1 sets starting `fromDay` days after 1 Jan 2026, as one TLE file. */
function fileOf(n: number, fromDay: number) {
  return tleLines(Array.from({ length: n }, (_, i) => tern1Set(fromDay + i * 0.002, (i % 999) + 1))).join('\n') + '\n';
}

async function startImport(id: string) {
  const res = await engineer.post(`/api/orbit/uploads/${id}/import`).set('x-csrf-token', engineer.csrf).send({});
  expect(res.status, JSON.stringify(res.body)).toBe(202);
  return res.body.upload as UploadBody;
}

async function setsOf(fileTag: string) {
  const { rows } = await t.database.pool.query<{ n: number; keys: number }>(
    `select count(*)::int as n, count(distinct (epoch, element_set_no))::int as keys from element_sets s
      join element_set_files f on f.id = s.file_id where f.filename = $1`,
    [fileTag],
  );
  return rows[0]!;
}

describe('element-set uploads on the job system', () => {
  it('answers at once while a worker previews and imports, with progress rows rising to 100 %', async () => {
    const N = 30_000;
    // Every write to the upload row is logged by a trigger, so the test sees each progress step, not only those it polled.
    await t.database.pool.query(`
      create table progress_log (seq bigserial primary key, upload_id uuid, status text, processed int, total int);
      create function log_progress() returns trigger language plpgsql as $$
        begin insert into progress_log (upload_id, status, processed, total) values (new.id, new.status, new.processed, new.total); return new; end $$;
      create trigger orbit_ingest_jobs_progress after update on orbit_ingest_jobs for each row execute function log_progress();`);
    try {
      const res = await upload(engineer, craftId, fileOf(N, 0), 'progress.tle');
      expect(res.status, JSON.stringify(res.body)).toBe(202);
      const id = res.body.upload.id as string;
      // No worker yet: the upload waits, held, with its preview queued — nothing is parsed in the web request.
      expect(res.body.upload).toMatchObject({ status: 'parsing', progress: { processed: 0, total: 0 } });
      const { rows: queued } = await t.database.pool.query(
        "select data from pgboss.job where name = 'element-set-ingest' and data->>'uploadId' = $1",
        [id],
      );
      expect(queued.map((r) => r.data)).toEqual([{ uploadId: id, step: 'preview', accountId: expect.any(String) }]);
      const { rows: held } = await t.database.pool.query('select length(content)::int as n from orbit_ingest_jobs where id = $1', [id]);
      expect(held[0].n).toBeGreaterThan(N * 138);

      await worker();
      const preview = await settled(id);
      expect(preview.status).toBe('previewed');
      expect(preview.counts).toEqual({ records: N, new: N, duplicate: 0, invalid: 0 });
      expect(preview.progress).toEqual({ processed: N, total: N });
      expect(await countRows(t, 'element_sets')).toBe(0);

      // Poll the way the browser does while the import runs; record what each answer said.
      const { rows: clock } = await t.database.pool.query<{ now: Date }>('select clock_timestamp() as now');
      await startImport(id);
      const seen: number[] = [];
      const done = await until(
        async () => {
          const u = await getUpload(id);
          if (u.progress.total > 0) seen.push(u.progress.processed / u.progress.total);
          return u.status === 'imported' ? u : null;
        },
        60_000,
        10,
      );
      expect(done.importedCount).toBe(N);
      expect(done.progress).toEqual({ processed: N, total: N });
      for (let k = 1; k < seen.length; k++) expect(seen[k]).toBeGreaterThanOrEqual(seen[k - 1]!);
      expect(seen.at(-1)).toBe(1);

      const { rows: log } = await t.database.pool.query<{ processed: number; total: number }>(
        "select processed, total from progress_log where upload_id = $1 and status = 'importing' and total > 0 order by seq",
        [id],
      );
      const steps = log.map((r) => r.processed);
      // COPY hands the rows over in chunks of 10,000: 10k, 20k, 30k of 30k, never backwards.
      expect(log.every((r) => r.total === N)).toBe(true);
      for (let k = 1; k < steps.length; k++) expect(steps[k]).toBeGreaterThanOrEqual(steps[k - 1]!);
      expect([...new Set(steps)].filter((n) => n > 0)).toEqual([10_000, 20_000, 30_000]);
      expect(await setsOf('progress.tle')).toEqual({ n: N, keys: N });
      // A large import refreshes the planner's statistics of the columns the orbit queries use, in its transaction
      // (the trend of a fresh 20,000-set history once ran into the statement timeout on stale ones).
      const { rows: analyzed } = await t.database.pool.query<{ at: Date | null; n: number }>(
        `select last_analyze as at, (select reltuples::float8 from pg_class where relname = 'element_sets') as n
           from pg_stat_user_tables where relname = 'element_sets'`,
      );
      expect(analyzed[0]!.at!.getTime()).toBeGreaterThan(clock[0]!.now.getTime());
      expect(analyzed[0]!.n).toBeGreaterThan(N * 0.9);
      const { rows: columns } = await t.database.pool.query<{ attname: string }>(
        "select attname from pg_stats where tablename = 'element_sets' order by attname",
      );
      expect(columns.map((c) => c.attname)).toEqual(expect.arrayContaining(['epoch_ms', 'outlier', 'spacecraft_id']));
    } finally {
      await t.database.pool.query(
        'drop trigger orbit_ingest_jobs_progress on orbit_ingest_jobs; drop function log_progress(); drop table progress_log',
      );
    }
  }, 400_000);

  it('finishes an import whose worker was killed mid-way with exactly the right number of sets', async () => {
    const N = 20_000;
    child = await spawnWorker();
    const res = await upload(engineer, craftId, fileOf(N, 200), 'killed.tle');
    expect(res.status).toBe(202);
    const id = res.body.upload.id as string;
    const preview = await settled(id);
    expect(preview.counts.new).toBe(N);

    // Hold the import at its last statement: every set is COPYed (uncommitted) when the worker dies.
    const blocker = new pg.Client({ connectionString: t.database.url });
    await blocker.connect();
    try {
      await blocker.query('begin');
      await blocker.query('lock table audit_log in share mode');
      await startImport(id);
      await until(async () => {
        const u = await getUpload(id);
        return u.status === 'importing' && u.progress.processed === N;
      });
      child.kill('SIGKILL');
      await new Promise((r) => child!.once('exit', r));
      child = undefined;
      expect(await setsOf('killed.tle')).toEqual({ n: 0, keys: 0 });
    } finally {
      await blocker.query('rollback');
      await blocker.end();
    }
    // Still importing, never "failed", while the job waits out its expiry; then another worker takes it.
    expect((await getUpload(id)).status).toBe('importing');
    await worker();
    const done = await settled(id);
    expect(done.status).toBe('imported');
    expect(done.importedCount).toBe(N);
    expect(await setsOf('killed.tle')).toEqual({ n: N, keys: N });
    const { rows: jobs } = await t.database.pool.query<{ retry_count: number; state: string }>(
      "select retry_count, state from pgboss.job where name = 'element-set-ingest' and data->>'uploadId' = $1 and data->>'step' = 'import'",
      [id],
    );
    expect(jobs).toHaveLength(1);
    expect(jobs[0]!.retry_count).toBeGreaterThanOrEqual(1);
    const { rows: audit } = await t.database.pool.query(
      "select 1 from audit_log where action = 'element_sets.imported' and after->>'jobId' = $1",
      [id],
    );
    expect(audit).toHaveLength(1);
  }, 400_000);

  it('stores each set once when two workers import two uploads of the same file at the same time', async () => {
    const N = 15_000;
    const text = fileOf(N, 400);
    const admin = agentFor(t.app);
    await signIn(admin, 'admin@saltmarsh.example', DEMO_PASSWORD);
    const [ra, rb] = await Promise.all([upload(engineer, craftId, text, 'twice.tle'), upload(admin, craftId, text, 'twice.tle')]);
    expect([ra.status, rb.status]).toEqual([202, 202]);
    await worker();
    await worker();
    const [a, b] = await Promise.all([settled(ra.body.upload.id), settled(rb.body.upload.id)]);
    expect([a.counts.new, b.counts.new]).toEqual([N, N]);
    const before = await countRows(t, 'element_sets');
    await Promise.all([startImport(a.id), admin.post(`/api/orbit/uploads/${b.id}/import`).set('x-csrf-token', admin.csrf).send({})]);
    const [ia, ib] = await Promise.all([settled(a.id), settled(b.id)]);
    expect([ia.status, ib.status]).toEqual(['imported', 'imported']);
    expect(ia.importedCount! + ib.importedCount!).toBe(N);
    expect(await countRows(t, 'element_sets')).toBe(before + N);
    expect(await setsOf('twice.tle')).toEqual({ n: N, keys: N });
    // The import that waited for the other's lock may outlive its short expiry here and be handed out again: that
    // second run finds its upload imported and stores nothing. Both jobs end completed, the counts unchanged.
    await until(async () => {
      const { rows } = await t.database.pool.query<{ state: string }>(
        "select state from pgboss.job where name = 'element-set-ingest' and data->>'step' = 'import' and data->>'uploadId' = any($1::text[])",
        [[a.id, b.id]],
      );
      return rows.length === 2 && rows.every((r) => r.state === 'completed');
    });
    expect(await setsOf('twice.tle')).toEqual({ n: N, keys: N });
    expect((await getUpload(b.id)).importedCount! + (await getUpload(a.id)).importedCount!).toBe(N);
  }, 400_000);

  it('keeps an import running through failed attempts, then marks it failed with nothing stored', async () => {
    // Every attempt fails inside the import's transaction (a trigger refuses the file row).
    await t.database.pool.query(`
      create function refuse_doomed() returns trigger language plpgsql as $$
        begin if new.filename = 'doomed.tle' then raise exception 'disk on fire'; end if; return new; end $$;
      create trigger element_set_files_doomed before insert on element_set_files for each row execute function refuse_doomed();`);
    try {
      await worker();
      const res = await upload(engineer, craftId, fileOf(50, 600), 'doomed.tle');
      const preview = await settled(res.body.upload.id);
      expect(preview.counts.new).toBe(50);
      await startImport(preview.id);
      await until(async () => {
        const { rows } = await t.database.pool.query(
          "select retry_count from pgboss.job where name = 'element-set-ingest' and data->>'uploadId' = $1 and data->>'step' = 'import' and retry_count >= 1",
          [preview.id],
        );
        return rows.length > 0;
      });
      // Between attempts the upload still says it is importing.
      expect((await getUpload(preview.id)).status).toBe('importing');
      const failed = await settled(preview.id);
      expect(failed.status).toBe('failed');
      expect(failed.message).toBe(
        'The import failed on our side and nothing was stored. Upload the file again; if it fails again, report it.',
      );
      expect(await setsOf('doomed.tle')).toEqual({ n: 0, keys: 0 });
      const { rows } = await t.database.pool.query('select content from orbit_ingest_jobs where id = $1', [preview.id]);
      expect(rows[0].content).toBeNull();
    } finally {
      await t.database.pool.query('drop trigger element_set_files_doomed on element_set_files; drop function refuse_doomed()');
    }
  }, 400_000);

  it('a status request holding the current version waits for the next change, then answers with it', async () => {
    const res = await upload(engineer, craftId, fileOf(50, 800), 'held.tle');
    expect(res.status, JSON.stringify(res.body)).toBe(202);
    const first = res.body.upload as UploadBody & { version: string };
    expect(first.status).toBe('parsing');
    // No worker yet: asked with the version it holds, the request is held rather than answered with the same thing.
    const asked = Date.now();
    let answeredAt = 0;
    const held = engineer
      .get(`/api/orbit/uploads/${first.id}`)
      .query({ after: first.version, wait: 20 })
      .then((r) => ((answeredAt = Date.now()), r));
    await new Promise((r) => setTimeout(r, 800));
    expect(answeredAt).toBe(0);
    // The preview lands (a worker starts now): the held request answers with it, long before its 20 s.
    const started = Date.now();
    await worker();
    const answer = await held;
    expect(answer.status).toBe(200);
    expect(answer.body.upload).toMatchObject({ id: first.id, status: 'previewed', counts: { new: 50 } });
    expect(answer.body.upload.version).not.toBe(first.version);
    expect(answeredAt - started).toBeLessThan(15_000);
    expect(answeredAt - asked).toBeGreaterThanOrEqual(800);
    // Done working, or holding an older version: the answer comes at once.
    const previewed = answer.body.upload as { version: string };
    const t0 = Date.now();
    const again = await engineer.get(`/api/orbit/uploads/${first.id}`).query({ after: previewed.version }).expect(200);
    const stale = await engineer.get(`/api/orbit/uploads/${first.id}`).query({ after: first.version }).expect(200);
    expect(Date.now() - t0).toBeLessThan(5_000);
    expect([again.body.upload.status, stale.body.upload.status]).toEqual(['previewed', 'previewed']);
  }, 120_000);

  it('a held status request answers after its wait with the upload unchanged when nothing happened', async () => {
    const res = await upload(engineer, craftId, fileOf(3, 900), 'unchanged.tle');
    expect(res.status).toBe(202);
    const t0 = Date.now();
    const same = await engineer.get(`/api/orbit/uploads/${res.body.upload.id}`).query({ after: res.body.upload.version, wait: 1 });
    expect(same.status).toBe(200);
    expect(Date.now() - t0).toBeGreaterThanOrEqual(950);
    expect(same.body.upload).toMatchObject({ status: 'parsing', version: res.body.upload.version });
  });

  it('refuses a status request whose wait or version is not one it can use, naming the field', async () => {
    const id = '00000000-0000-4000-8000-0000000000ab';
    const tooLong = await engineer.get(`/api/orbit/uploads/${id}`).query({ after: 'x'.repeat(101) });
    expect(tooLong.status).toBe(400);
    expect(JSON.stringify(tooLong.body)).toContain('after');
    const noWait = await engineer.get(`/api/orbit/uploads/${id}`).query({ after: '1.parsing.0', wait: 0 });
    expect(noWait.status).toBe(400);
    expect(JSON.stringify(noWait.body)).toContain('wait');
  });

  it('answers 503 from a web process started without the job system, storing nothing', async () => {
    const bare = createApp({
      db: t.database.db,
      pool: t.database.pool,
      config: t.config,
      mailer: createMailerFromConfig(t.config),
      stripe: createStripeFromConfig(t.config),
    });
    const a = agentFor(bare);
    await signIn(a, 'engineer@saltmarsh.example', DEMO_PASSWORD);
    const before = await countRows(t, 'orbit_ingest_jobs');
    const res = await upload(a, craftId, fileOf(2, 700), 'no-workers.tle');
    expect(res.status).toBe(503);
    expect(res.body.error.code).toBe('orbit.ingest_unavailable');
    expect(await countRows(t, 'orbit_ingest_jobs')).toBe(before);
  });
});
