// The pledge state machine does not depend on delivery order: every permutation of the events of one pledge,
// posted through the real (signed) webhook route, ends in the same state, slot and ledger.
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import {
  CARDS,
  createWorld,
  eventsFor,
  ledgerOf,
  payOnHostedPage,
  pledgeRow,
  postEvent,
  soldCount,
  startPledge,
  type World,
} from './pledges-fixtures';

let w: World;
beforeAll(async () => {
  w = await createWorld();
}, 60_000);
afterAll(async () => w?.close());
beforeEach(() => {
  w.fake.faults.reset();
});

function permutations<T>(items: T[]): T[][] {
  if (items.length <= 1) return [items];
  return items.flatMap((x, i) => permutations([...items.slice(0, i), ...items.slice(i + 1)]).map((rest) => [x, ...rest]));
}

/** The events of a pledge's checkout session and payment intents that the app acts on, as the fake recorded them. */
function pledgeEvents(sessionId: string, pledgeId: string, types: string[]) {
  return w.fake
    .state()
    .collections.event.filter(
      (e) => types.includes(e.type) && (e.data.object.id === sessionId || e.data.object.metadata?.pledge_id === pledgeId),
    );
}

describe('a declined payment whose checkout then expires', () => {
  const types = ['payment_intent.payment_failed', 'checkout.session.expired'];

  it('ends abandoned with the slot given back, in every delivery order', async () => {
    const orders = permutations([0, 1]);
    const outcomes: unknown[] = [];
    for (const order of orders) {
      w.fake.faults.set({ dropWebhooks: true });
      const sold = await soldCount(w, w.tier.limited.id);
      const res = await startPledge(w.backer, { tierId: w.tier.limited.id, amountMinor: 25_000 });
      expect(res.status, JSON.stringify(res.body)).toBe(201);
      expect((await payOnHostedPage(res.body.checkoutUrl, CARDS.declined)).status).toBe(402);
      const row = await pledgeRow(w, res.body.pledge.id);
      await w.stripe.checkout.sessions.expire(row.checkoutSessionId!);
      const events = pledgeEvents(row.checkoutSessionId!, row.id, types);
      expect(events.map((e) => e.type).sort()).toEqual([...types].sort());

      for (const i of order) expect((await postEvent(w, events[i]!)).status).toBe(200);
      const after = await pledgeRow(w, row.id);
      outcomes.push({
        state: after.state,
        slot: after.slotState,
        url: after.checkoutUrl,
        sold: (await soldCount(w, w.tier.limited.id)) - sold,
      });
    }
    for (const o of outcomes) expect(o).toEqual({ state: 'abandoned', slot: 'released', url: null, sold: 0 });
  }, 60_000);
});

describe('a declined card, then a good one, then a partial refund', () => {
  const types = ['payment_intent.payment_failed', 'payment_intent.succeeded', 'checkout.session.completed', 'charge.refunded'];

  it('ends partly refunded with one charge, its fee and the refund, in all 24 delivery orders', async () => {
    const finals = new Map<string, unknown>();
    for (const order of permutations([0, 1, 2, 3])) {
      w.fake.faults.set({ dropWebhooks: true });
      const res = await startPledge(w.backer, { tierId: w.tier.patch.id, amountMinor: 3000 });
      expect(res.status).toBe(201);
      expect((await payOnHostedPage(res.body.checkoutUrl, CARDS.declined)).status).toBe(402);
      expect((await payOnHostedPage(res.body.checkoutUrl, CARDS.ok)).status).toBe(303);
      const row = await pledgeRow(w, res.body.pledge.id);
      const session = await w.stripe.checkout.sessions.retrieve(row.checkoutSessionId!);
      const refund = await w.stripe.refunds.create({ payment_intent: session.payment_intent as string, amount: 1000 });
      const refunded = eventsFor(w, refund.charge as string, ['charge.refunded']);
      const events = [...pledgeEvents(session.id, row.id, types.slice(0, 3)), ...refunded];
      expect(events.map((e) => e.type).sort()).toEqual([...types].sort());

      for (const i of order) expect((await postEvent(w, events[i]!)).status).toBe(200);
      const after = await pledgeRow(w, row.id);
      finals.set(order.join(''), {
        state: after.state,
        failure: after.failureCode,
        ledger: (await ledgerOf(w, row.id)).map((l) => [l.kind, l.amountMinor]),
      });
    }
    expect(finals.size).toBe(24);
    // 2.9 % + 30 of 30.00 = 0.87 + 0.30 (the fake's fee, README)
    for (const [order, f] of finals)
      expect(f, order).toEqual({
        state: 'partly_refunded',
        failure: null,
        ledger: [
          ['charge', 3000],
          ['fee', -117],
          ['refund', -1000],
        ],
      });
  }, 120_000);
});
