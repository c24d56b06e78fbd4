import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { agentFor, signIn, type Agent } from '../setup/test-app';
import { DEMO_PASSWORD } from '../../server/demo/accounts';
import { createDispatch, dispatchDesk, transition } from './dispatches-fixtures';
import { appWithJobs, startWorker, waitFor } from './dispatches-jobs-helpers';

let ctx: Awaited<ReturnType<typeof dispatchDesk>>;
let web: Awaited<ReturnType<typeof appWithJobs>>;
let worker: Awaited<ReturnType<typeof startWorker>> | undefined;
let outreach: Agent;

beforeAll(async () => {
  ctx = await dispatchDesk({ JOBS_SHUTDOWN_TIMEOUT_MS: '5000' });
  web = await appWithJobs(ctx.t);
  outreach = agentFor(web.app);
  await signIn(outreach, 'outreach@saltmarsh.example', DEMO_PASSWORD);
});
afterAll(async () => {
  await worker?.stop();
  await web.jobs.stop();
  await ctx.t.close();
});

const stateOf = async (id: string) => (await outreach.get(`/api/dispatches/${id}`).expect(200)).body.dispatch;

describe('a scheduled publish', () => {
  it('is a job that publishes the dispatch at its time, in a worker process; an unscheduled one stays a draft', async () => {
    const at = new Date(Date.now() + 2500).toISOString();
    const d = await createDispatch(outreach, { title: 'Scheduled: the first raising period' });
    const res = await transition(outreach, d.id, { to: 'scheduled', publishAt: at });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    expect(res.body.dispatch).toMatchObject({ state: 'scheduled', publishAt: at, allowed: ['draft', 'published'] });

    // A second dispatch, scheduled and then taken back to draft: its job must do nothing.
    const back = await createDispatch(outreach, { title: 'Scheduled, then pulled' });
    await transition(outreach, back.id, { to: 'scheduled', publishAt: at }).expect(200);
    await transition(outreach, back.id, { to: 'draft' }).expect(200);

    // The job row exists in pg-boss, written in the same transaction as the state change.
    const { rows } = await ctx.t.database.pool.query(
      `select data, start_after from pgboss.job where name = 'dispatch-publish' and data->>'dispatchId' = $1`,
      [d.id],
    );
    expect(rows).toHaveLength(1);
    expect(new Date(rows[0].start_after).toISOString()).toBe(at);

    // Nobody publishes it by hand; before its time it stays scheduled even with a worker running.
    worker = await startWorker(ctx.t);
    expect((await stateOf(d.id)).state).toBe('scheduled');
    const published = await waitFor(async () => {
      const s = await stateOf(d.id);
      return s.state === 'published' ? s : null;
    }, 20_000);
    expect(Date.parse(published.publishedAt)).toBeGreaterThanOrEqual(Date.parse(at));
    expect(published.version).toBe(1);
    expect((await agentFor(web.app).get(`/api/public/dispatches/${d.slug}`)).status).toBe(200);

    await waitFor(async () => {
      const { rows: done } = await ctx.t.database.pool.query(
        `select count(*)::int as n from pgboss.job where name = 'dispatch-publish' and state = 'completed'`,
      );
      return done[0].n === 2;
    }, 20_000);
    expect((await stateOf(back.id)).state).toBe('draft');
  });

  it('rescheduling leaves the old job harmless: only the latest time publishes', async () => {
    const d = await createDispatch(outreach, { title: 'Moved to later' });
    await transition(outreach, d.id, { to: 'scheduled', publishAt: new Date(Date.now() + 1500).toISOString() }).expect(200);
    await transition(outreach, d.id, { to: 'draft' }).expect(200);
    const later = new Date(Date.now() + 60 * 60_000).toISOString();
    await transition(outreach, d.id, { to: 'scheduled', publishAt: later }).expect(200);
    await new Promise((r) => setTimeout(r, 4000));
    const s = await stateOf(d.id);
    expect(s).toMatchObject({ state: 'scheduled', publishAt: later });
  });
});
