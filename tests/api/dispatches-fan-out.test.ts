import type { ChildProcess } from 'node:child_process';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { agentFor, signIn, type Agent } from '../setup/test-app';
import { spawnWorkerProcess } from '../setup/worker-process';
import { DEMO_PASSWORD } from '../../server/demo/accounts';
import { createDispatch, dispatchDesk, insertManyBackers, insertMember, insertTiers, transition } from './dispatches-fixtures';
import { appWithJobs, startWorker, waitFor } from './dispatches-jobs-helpers';

// 2,000 members, a rate-limited mail service, and a worker process killed with SIGKILL while it sends:
// every member still gets exactly one message (counted at the mail fake's outbox).

const N = 2000;
let ctx: Awaited<ReturnType<typeof dispatchDesk>>;
let web: Awaited<ReturnType<typeof appWithJobs>>;
let outreach: Agent;
let child: ChildProcess | undefined;
let worker: Awaited<ReturnType<typeof startWorker>> | undefined;

beforeAll(async () => {
  ctx = await dispatchDesk({
    MAIL_LEASE_SECONDS: '5',
    MAIL_POLL_MS: '200',
    MAIL_MAX_BACKOFF_SECONDS: '2',
    JOBS_SHUTDOWN_TIMEOUT_MS: '5000',
  });
  web = await appWithJobs(ctx.t);
  outreach = agentFor(web.app);
  await signIn(outreach, 'outreach@saltmarsh.example', DEMO_PASSWORD);
}, 60_000);
afterAll(async () => {
  child?.kill('SIGKILL');
  await worker?.stop();
  await web.jobs.stop();
  await ctx.t.close();
});

/** `npm run worker` as a real child process on the test database and mail fake. */
const spawnWorker = () => spawnWorkerProcess(ctx.t.config, { MAIL_LEASE_SECONDS: '5', MAIL_POLL_MS: '200', MAIL_MAX_BACKOFF_SECONDS: '2' });

describe('e-mailing a dispatch to 2,000 members', () => {
  it('delivers exactly one message per member through 429s and a worker killed mid-send', async () => {
    const db = ctx.t.database.db;
    const world = await insertTiers(ctx.t);
    const ids = await insertManyBackers(db, world.campaignId, world.patch.id, N, 'fan');
    // Two who must not get it: unsubscribed from dispatches, and a backer of another tier.
    await insertMember(db, world.campaignId, { email: 'quiet@members.example', tierId: world.patch.id, dispatches: false });
    await insertMember(db, world.campaignId, { email: 'other@members.example', tierId: world.fragment.id });
    expect(ids).toHaveLength(N);

    const d = await createDispatch(outreach, {
      title: 'Patch holders: ten days of raising',
      audience: { kind: 'tiers', tierIds: [world.patch.id] },
      emailOnPublish: true,
    });
    // Each batch call is slow (so the kill lands mid-send) and the first calls are rate-limited.
    ctx.t.mail.faults.set({ delayMs: 250, rateLimitNext: 4, retryAfterSeconds: 1 });
    child = await spawnWorker();
    await transition(outreach, d.id, { to: 'published' }).expect(200);

    const inOutbox = () => ctx.t.mail.messages().filter((m) => m.subject === 'Patch holders: ten days of raising');
    await waitFor(async () => inOutbox().length >= 500, 60_000, 50).catch(async (e) => {
      const q = await ctx.t.database.pool.query(`select state, count(*)::int n, max(last_answer::text) a from mail_queue group by state`);
      const s = await ctx.t.database.pool.query(`select * from dispatch_sends`);
      const j = await ctx.t.database.pool.query(`select name, state, output::text from pgboss.job`);
      console.log(
        JSON.stringify(
          {
            q: q.rows,
            s: s.rows,
            j: j.rows.map((r) => ({ ...r, output: String(r.output).slice(0, 600) })),
            out: ctx.t.mail.messages().length,
          },
          null,
          1,
        ),
      );
      throw e;
    });
    child.kill('SIGKILL');
    await new Promise((r) => child!.once('exit', r));
    const atKill = inOutbox().length;
    expect(atKill).toBeLessThan(N);
    // Rows the dead worker had claimed are still "sending" under its lease; another worker takes over.
    worker = await startWorker(ctx.t);

    const progress = await waitFor(
      async () => {
        const p = (await outreach.get(`/api/dispatches/${d.id}/progress`).expect(200)).body.progress;
        return p.state === 'done' ? p : null;
      },
      120_000,
      300,
    );
    expect(progress).toMatchObject({ total: N, sent: N, failed: 0, queued: 0 });

    const perAddress = new Map<string, number>();
    for (const m of inOutbox()) for (const to of m.to) perAddress.set(to, (perAddress.get(to) ?? 0) + 1);
    expect(perAddress.size).toBe(N);
    expect([...perAddress.values()].every((n) => n === 1)).toBe(true);
    expect(perAddress.has('quiet@members.example')).toBe(false);
    expect(perAddress.has('other@members.example')).toBe(false);
    expect(ctx.t.mail.faults.get().rateLimitNext).toBe(0);

    // Every message is a batch member, carries one-click unsubscribe headers and its own signed link.
    const sample = inOutbox()[0]!;
    expect(sample.batch_id).not.toBeNull();
    expect(sample.headers['List-Unsubscribe']).toMatch(
      /^<http:\/\/127\.0\.0\.1:3999\/api\/email-choices\/unsubscribe\?token=[\w-]+\.[\w-]+>$/,
    );
    expect(sample.headers['List-Unsubscribe-Post']).toBe('List-Unsubscribe=One-Click');
    const token = /token=([\w.-]+)>/.exec(sample.headers['List-Unsubscribe']!)![1]!;
    expect(sample.html).toContain(`/unsubscribe?token=${token}`);
    expect(sample.text).toContain(`/unsubscribe?token=${token}`);
    expect(sample.html).toContain('/my-support/email');

    // What every copy shares is stored once; each of the 2,000 rows keeps only its own link and names that row.
    const pool = ctx.t.database.pool;
    const { rows: sharedRows } = await pool.query<{ key: string; data: Record<string, unknown> }>(
      `select key, data from mail_shared where key = $1`,
      [`dispatch/${d.id}`],
    );
    expect(sharedRows).toHaveLength(1);
    expect(sharedRows[0]!.data).toMatchObject({ title: 'Patch holders: ten days of raising' });
    const { rows: shapes } = await pool.query<{ keys: string; shared_key: string | null; n: number }>(
      `select (select string_agg(k, ',') from jsonb_object_keys(data) k) as keys, shared_key, count(*)::int as n
         from mail_queue where batch_key like $1 group by 1, 2`,
      [`dispatch/${d.id}/%`],
    );
    expect(shapes).toEqual([{ keys: 'unsubscribeUrl', shared_key: `dispatch/${d.id}`, n: N }]);

    // The fan-out ran once: another e-mail request for the same dispatch is refused.
    const again = await outreach.post(`/api/dispatches/${d.id}/email`).set('x-csrf-token', outreach.csrf).send({});
    expect(again.status).toBe(409);
  }, 240_000);

  it('lists failures per recipient and sends them again on retry', async () => {
    const db = ctx.t.database.db;
    const world = await insertTiers(ctx.t);
    await insertManyBackers(db, world.campaignId, world.fragment.id, 150, 'retry');
    const d = await createDispatch(outreach, {
      title: 'Station hour holders: a pass tonight',
      audience: { kind: 'tiers', tierIds: [world.fragment.id] },
    });
    await transition(outreach, d.id, { to: 'published' }).expect(200);
    // Publish without e-mail, then e-mail it by hand while the service refuses everything.
    ctx.t.mail.faults.set({ delayMs: 0, failNext: 1000 });
    await outreach.post(`/api/dispatches/${d.id}/email`).set('x-csrf-token', outreach.csrf).send({}).expect(202);
    await ctx.t.database.pool.query(`update mail_batches set attempts = 9 where key like $1`, [`dispatch/${d.id}/%`]);
    const failed = await waitFor(
      async () => {
        const p = (await outreach.get(`/api/dispatches/${d.id}/progress`).expect(200)).body.progress;
        return p.total === 150 && p.failed === 150 ? p : null;
      },
      60_000,
      300,
    );
    expect(failed.failures[0]).toMatchObject({ error: expect.stringMatching(/internal_server_error \(500\)/) });
    expect(failed.failures[0].email).toMatch(/^retry-\d+@members\.example$/);

    ctx.t.mail.faults.set({ failNext: 0 });
    const one = failed.failures[0].mailId;
    const r1 = await outreach
      .post(`/api/dispatches/${d.id}/retry`)
      .set('x-csrf-token', outreach.csrf)
      .send({ mailIds: [one] })
      .expect(202);
    expect(r1.body.retried).toBe(1);
    await waitFor(
      async () => {
        const p = (await outreach.get(`/api/dispatches/${d.id}/progress`).expect(200)).body.progress;
        return p.sent === 1 && p.failed === 149 ? p : null;
      },
      30_000,
      200,
    );
    const r2 = await outreach.post(`/api/dispatches/${d.id}/retry`).set('x-csrf-token', outreach.csrf).send({}).expect(202);
    expect(r2.body.retried).toBe(149);
    const done = await waitFor(
      async () => {
        const p = (await outreach.get(`/api/dispatches/${d.id}/progress`).expect(200)).body.progress;
        return p.state === 'done' ? p : null;
      },
      30_000,
      200,
    );
    expect(done).toMatchObject({ sent: 150, failed: 0 });
    const to = ctx.t.mail.messages().filter((m) => m.subject === 'Station hour holders: a pass tonight');
    expect(new Set(to.map((m) => m.to[0])).size).toBe(150);
    expect(to).toHaveLength(150);
  }, 120_000);
});
