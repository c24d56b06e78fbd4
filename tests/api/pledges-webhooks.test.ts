import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import {
  CARDS,
  counts,
  createWorld,
  eventsFor,
  ledgerOf,
  payOnHostedPage,
  paidPledge,
  pledgeRow,
  postEvent,
  settle,
  signedInAgent,
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

/** A pledge paid on the hosted page while the fake records events but delivers none. */
async function paidWithoutWebhooks(body: Record<string, unknown>, card: string = CARDS.ok) {
  w.fake.faults.set({ dropWebhooks: true });
  const res = await startPledge(w.backer, body);
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  const paid = await payOnHostedPage(res.body.checkoutUrl, card);
  expect(paid.status).toBe(303);
  w.fake.faults.set({ dropWebhooks: false });
  const row = await pledgeRow(w, res.body.pledge.id);
  const session = await w.stripe.checkout.sessions.retrieve(row.checkoutSessionId!);
  return { id: row.id, session, pi: session.payment_intent as string | null };
}

describe('webhook idempotency', () => {
  it('changes nothing when an event is delivered again, by the processor or replayed by hand', async () => {
    const { id } = await paidPledge(w, w.backer, { tierId: w.tier.patch.id, amountMinor: 4000 });
    expect((await pledgeRow(w, id)).state).toBe('paid');
    const before = await counts(w);
    const row = await pledgeRow(w, id);
    const completed = eventsFor(w, row.checkoutSessionId!, ['checkout.session.completed'])[0]!;
    const succeeded = eventsFor(w, row.paymentIntentId!, ['payment_intent.succeeded'])[0]!;

    w.fake.webhooks.redeliver(completed.id);
    w.fake.webhooks.redeliver(succeeded.id);
    await settle(w);
    const replay = await postEvent(w, completed);
    expect(replay.status).toBe(200);
    expect(await replay.json()).toEqual({ received: true, outcome: 'duplicate' });

    expect(await counts(w)).toEqual(before);
    expect((await ledgerOf(w, id)).map((l) => l.kind)).toEqual(['charge', 'fee']);
    const deliveries = w.fake.webhooks.deliveries().filter((d) => d.eventId === completed.id);
    expect(deliveries.map((d) => d.status)).toEqual(['delivered', 'delivered']);
  });
});

describe('webhook signatures', () => {
  it('answers 400 to a forged, tampered or unsigned event and records nothing', async () => {
    const { id, session } = await paidWithoutWebhooks({ tierId: w.tier.patch.id, amountMinor: 2600 });
    const completed = eventsFor(w, session.id, ['checkout.session.completed'])[0]!;
    const before = await counts(w);

    const forged = await postEvent(w, completed, { secret: 'whsec_someone_else' });
    expect(forged.status).toBe(400);
    expect((await forged.json()).error.code).toBe('payments.signature_invalid');

    const original = JSON.stringify(completed);
    const tampered = original.replace('"amount_total":2600', '"amount_total":1');
    expect(tampered).not.toBe(original);
    const signedOriginal = await import('../../fakes/payments/webhooks').then((m) =>
      m.signatureHeader(original, 'whsec_test_pledges_0123456789'),
    );
    const tamperedRes = await fetch(`${w.baseUrl}/api/payments/webhook`, {
      method: 'POST',
      headers: { 'content-type': 'application/json', 'stripe-signature': signedOriginal },
      body: tampered,
    });
    expect(tamperedRes.status).toBe(400);

    const unsigned = await fetch(`${w.baseUrl}/api/payments/webhook`, {
      method: 'POST',
      headers: { 'content-type': 'application/json' },
      body: original,
    });
    expect(unsigned.status).toBe(400);
    expect((await unsigned.json()).error.code).toBe('payments.signature_missing');

    // Older than the SDK's 300 s tolerance (REFERENCES.md §7).
    const stale = await fetch(`${w.baseUrl}/api/payments/webhook`, {
      method: 'POST',
      headers: {
        'content-type': 'application/json',
        'stripe-signature': await import('../../fakes/payments/webhooks').then((m) =>
          m.signatureHeader(original, 'whsec_test_pledges_0123456789', Math.floor(Date.now() / 1000) - 600),
        ),
      },
      body: original,
    });
    expect(stale.status).toBe(400);

    expect(await counts(w)).toEqual(before);
    expect((await pledgeRow(w, id)).state).toBe('started');

    const genuine = await postEvent(w, completed);
    expect(genuine.status).toBe(200);
    expect((await pledgeRow(w, id)).state).toBe('paid');
  });
});

describe('events out of order', () => {
  it('ends paid with one charge when the payment event comes before the checkout event, and the rest arrive newest first', async () => {
    await w.t.flushMail();
    const mailsBefore = w.t.mail.messages().length;
    const { id, session, pi } = await paidWithoutWebhooks({ tierId: w.tier.patch.id, amountMinor: 7000 });
    const all = w.fake.state().collections.event.filter((e) => e.data?.object?.id === session.id || e.data?.object?.id === pi);
    const succeeded = all.find((e) => e.type === 'payment_intent.succeeded')!;
    const completed = all.find((e) => e.type === 'checkout.session.completed')!;

    expect((await postEvent(w, succeeded)).status).toBe(200);
    expect((await pledgeRow(w, id)).state).toBe('paid');
    expect((await postEvent(w, completed)).status).toBe(200);
    for (const e of [...all].reverse()) expect((await postEvent(w, e)).status).toBe(200);

    const row = await pledgeRow(w, id);
    expect(row.state).toBe('paid');
    expect(row.checkoutSessionId).toBe(session.id);
    expect(row.paymentIntentId).toBe(pi);
    // 2.9 % + 30¢ of 70.00 = 2.03 + 0.30 (REFERENCES.md §7)
    expect((await ledgerOf(w, id)).map((l) => [l.kind, l.amountMinor])).toEqual([
      ['charge', 7000],
      ['fee', -233],
    ]);
    await w.t.flushMail();
    expect(w.t.mail.messages().length - mailsBefore).toBe(1);
  });

  it('reconciles a refund that arrives before the payment: charge and refund recorded, state stays partly refunded', async () => {
    const { id, session, pi } = await paidWithoutWebhooks({ tierId: w.tier.patch.id, amountMinor: 6000 });
    w.fake.faults.set({ dropWebhooks: true });
    const refund = await w.stripe.refunds.create({ payment_intent: pi!, amount: 1500 });
    w.fake.faults.set({ dropWebhooks: false });
    const chargeId = refund.charge as string;

    const refunded = eventsFor(w, chargeId, ['charge.refunded'])[0]!;
    expect((await postEvent(w, refunded)).status).toBe(200);
    expect((await pledgeRow(w, id)).state).toBe('partly_refunded');

    for (const e of [...eventsFor(w, pi!), ...eventsFor(w, session.id)]) expect((await postEvent(w, e)).status).toBe(200);
    expect((await pledgeRow(w, id)).state).toBe('partly_refunded');
    expect((await ledgerOf(w, id)).map((l) => [l.kind, l.amountMinor])).toEqual([
      ['charge', 6000],
      ['fee', -204],
      ['refund', -1500],
    ]);
  });

  it('asks for a retry (non-2xx) when a refund of a membership charge comes before its invoice, then applies it', async () => {
    w.fake.faults.set({ dropWebhooks: true });
    const res = await startPledge(w.backer, { tierId: w.tier.crew.id, amountMinor: 800 });
    expect(res.status).toBe(201);
    expect((await payOnHostedPage(res.body.checkoutUrl, CARDS.ok)).status).toBe(303);
    const invoicePaid = w.fake
      .state()
      .collections.event.find(
        (e) => e.type === 'invoice.paid' && e.data.object.parent?.subscription_details?.metadata?.pledge_id === res.body.pledge.id,
      )!;
    const piId = invoicePaid.data.object.payments.data[0].payment.payment_intent as string;
    const refund = await w.stripe.refunds.create({ payment_intent: piId });
    w.fake.faults.set({ dropWebhooks: false });
    const refunded = eventsFor(w, refund.charge as string, ['charge.refunded'])[0]!;

    const early = await postEvent(w, refunded);
    expect(early.status).toBe(409);
    expect((await early.json()).error.code).toBe('payments.event_early');
    expect(await ledgerOf(w, res.body.pledge.id)).toEqual([]);

    expect((await postEvent(w, invoicePaid)).status).toBe(200);
    const again = await postEvent(w, refunded);
    expect(again.status).toBe(200);
    expect(((await again.json()) as { outcome: string }).outcome).toBe('applied');
    expect((await ledgerOf(w, res.body.pledge.id)).map((l) => [l.kind, l.amountMinor, l.processorInvoiceId !== null])).toEqual([
      ['charge', 800, true],
      ['fee', -53, true],
      ['refund', -800, false],
    ]);
    expect((await pledgeRow(w, res.body.pledge.id)).state).toBe('refunded');
  });
});

describe('the last slot of a limited tier', () => {
  it('goes to exactly one of several concurrent pledges; the others get 409 pledges.tier_sold_out', async () => {
    const agents = await Promise.all(['engineer', 'outreach', 'finance', 'admin'].map((r) => signedInAgent(w, `${r}@saltmarsh.example`)));
    const attempts = await Promise.all(
      [...agents, ...agents, w.backer].map((a) => startPledge(a, { tierId: w.tier.limited.id, amountMinor: 25_000 })),
    );
    const statuses = attempts.map((r) => r.status).sort();
    expect(statuses.filter((s) => s === 201)).toHaveLength(1);
    expect(statuses.filter((s) => s === 409)).toHaveLength(attempts.length - 1);
    for (const r of attempts.filter((x) => x.status === 409)) expect(r.body.error.code).toBe('pledges.tier_sold_out');

    const campaign = (await w.backer.get('/api/campaigns/tern-1').expect(200)).body.campaign;
    expect(campaign.tiers.find((t: { id: string }) => t.id === w.tier.limited.id)).toMatchObject({ remaining: 0, soldOut: true });

    // The winner leaves the checkout: the slot comes back and the next backer gets it.
    const winnerIndex = attempts.findIndex((r) => r.status === 201);
    const winner = [...agents, ...agents, w.backer][winnerIndex]!;
    await winner.post(`/api/pledges/${attempts[winnerIndex]!.body.pledge.id}/cancel`).set('x-csrf-token', winner.csrf).expect(200);
    const next = await startPledge(w.backer, { tierId: w.tier.limited.id, amountMinor: 25_000 });
    expect(next.status).toBe(201);
  });
});

describe('disputes', () => {
  it('marks a pledge paid with the dispute card as disputed, with the dispute and its fee in the ledger', async () => {
    const { id } = await paidPledge(w, w.backer, { tierId: w.tier.patch.id, amountMinor: 2500 }, CARDS.disputed);
    await settle(w);
    expect((await pledgeRow(w, id)).state).toBe('disputed');
    // 2.9 % + 30¢ of 25.00 = 0.725 → 0.73 (half up) + 0.30; dispute fee 15.00 (from memory, the fake's default)
    expect((await ledgerOf(w, id)).map((l) => [l.kind, l.amountMinor])).toEqual([
      ['charge', 2500],
      ['fee', -103],
      ['dispute', -2500],
      ['fee', -1500],
    ]);
  });
});
