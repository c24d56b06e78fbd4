// One pledge attempt submitted many times at once (a double click, a retrying client): one pledge, one
// checkout at the processor, and every submit is told the same checkout link.
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { pledges } from '../../server/modules/pledges/pledges.tables';
import { createWorld, soldCount, type World } from './pledges-fixtures';

let w: World;
beforeAll(async () => {
  w = await createWorld();
}, 60_000);
afterAll(async () => w?.close());
beforeEach(() => {
  w.fake.faults.reset();
});

describe('a pledge attempt submitted 20 times at once', () => {
  it('answers every submit with 2xx and the same checkout link; one pledge, one checkout session, one slot', async () => {
    // The processor answers slowly, so most submits arrive while the first is still opening its checkout.
    w.fake.faults.set({ latencyMs: 150 });
    const attemptKey = crypto.randomUUID();
    const sold = await soldCount(w, w.tier.patch.id);
    const body = { campaignSlug: 'tern-1', attemptKey, tierId: w.tier.patch.id, amountMinor: 2500 };
    const answers = await Promise.all(
      Array.from({ length: 20 }, () => w.backer.post('/api/pledges').set('x-csrf-token', w.backer.csrf).send(body)),
    );

    const statuses = answers.map((r) => r.status);
    for (const r of answers) expect(r.status, JSON.stringify(r.body)).toBeLessThan(300);
    expect(statuses.filter((s) => s === 201)).toHaveLength(1);

    const rows = await w.t.database.db.select().from(pledges).where(eq(pledges.idempotencyKey, attemptKey));
    expect(rows).toHaveLength(1);
    const pledgeId = rows[0]!.id;
    expect(new Set(answers.map((r) => r.body.pledge.id))).toEqual(new Set([pledgeId]));
    expect(new Set(answers.map((r) => r.body.checkoutUrl))).toEqual(new Set([rows[0]!.checkoutUrl]));
    expect(rows[0]!.checkoutUrl).toMatch(/^http:\/\/127\.0\.0\.1:\d+\/pay\//);

    const sessions = w.fake.state().collections.checkout_session.filter((s) => s.client_reference_id === pledgeId);
    expect(sessions).toHaveLength(1);
    expect(sessions[0]!.url).toBe(rows[0]!.checkoutUrl);
    expect(await soldCount(w, w.tier.patch.id)).toBe(sold + 1);
  }, 60_000);

  it('answers 202 with the pledge when the first submit is still opening the checkout after the wait; the pledge then shows the link', async () => {
    w.fake.faults.set({ latencyMs: 300 });
    const wait = w.t.config.PLEDGE_CHECKOUT_WAIT_MS;
    w.t.config.PLEDGE_CHECKOUT_WAIT_MS = 0;
    try {
      const body = { campaignSlug: 'tern-1', attemptKey: crypto.randomUUID(), amountMinor: 1500 };
      const post = () => w.backer.post('/api/pledges').set('x-csrf-token', w.backer.csrf).send(body);
      // .then() sends it now (a supertest request is lazy); whichever submit takes the row lock first opens the
      // checkout (201) and the other, with no time to wait, answers 202.
      const first = post().then((r) => r);
      await new Promise((r) => setTimeout(r, 150));
      const answers = await Promise.all([first, post()]);
      const a = answers.find((r) => r.status === 201)!;
      const b = answers.find((r) => r.status !== 201)!;
      expect(answers.map((r) => r.status).sort()).toEqual([201, 202]);
      expect(b.status, JSON.stringify(b.body)).toBe(202);
      expect(b.body.checkoutUrl).toBeNull();
      expect(b.body.pledge.id).toBe(a.body.pledge.id);
      const later = await w.backer.get(`/api/pledges/${b.body.pledge.id}`).expect(200);
      expect(later.body.pledge.checkoutUrl).toBe(a.body.checkoutUrl);
    } finally {
      w.t.config.PLEDGE_CHECKOUT_WAIT_MS = wait;
    }
  });
});
