// Events on a shared processor account that this app did not start: acknowledged (2xx) so the processor
// neither retries them nor disables the endpoint; refunds and disputes of charges we never made are kept
// in processor_event_unmatched for the reconciliation to report.
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { processorEventUnmatched } from '../../server/modules/payments/payments.tables';
import {
  CARDS,
  counts,
  createWorld,
  eventsFor,
  ledgerOf,
  payOnHostedPage,
  pledgeRow,
  postEvent,
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

async function unmatched(eventId: string) {
  return w.t.database.db.select().from(processorEventUnmatched).where(eq(processorEventUnmatched.eventId, eventId));
}

/** A charge made by another tool on the same processor account: its own customer, no pledge metadata. */
async function foreignCharge(amount: number) {
  w.fake.faults.set({ dropWebhooks: true });
  const customer = await w.stripe.customers.create({ email: 'orders@kestrel-yard.example', name: 'Another tool' });
  const pi = await w.stripe.paymentIntents.create({
    amount,
    currency: 'usd',
    customer: customer.id,
    payment_method: 'pm_card_visa',
    confirm: true,
    metadata: { order: 'K-7781' },
  });
  expect(pi.status).toBe('succeeded');
  return { pi, chargeId: pi.latest_charge as string };
}

describe('events the app did not start', () => {
  it('acknowledges an expired checkout of another tool (client reference not one of ours) with 2xx and changes nothing', async () => {
    w.fake.faults.set({ dropWebhooks: true });
    const session = await w.stripe.checkout.sessions.create({
      mode: 'payment',
      client_reference_id: 'order-K-7781',
      line_items: [{ price_data: { currency: 'usd', unit_amount: 1200, product_data: { name: 'Workshop seat' } }, quantity: 1 }],
      success_url: 'http://127.0.0.1:9/ok',
      cancel_url: 'http://127.0.0.1:9/no',
    });
    await w.stripe.checkout.sessions.expire(session.id);
    const expired = eventsFor(w, session.id, ['checkout.session.expired'])[0]!;
    const before = await counts(w);

    const res = await postEvent(w, expired);
    expect(res.status).toBe(200);
    expect(await res.json()).toEqual({ received: true, outcome: 'ignored' });
    // Delivered again: still 2xx, and nothing recorded beyond the event id.
    expect((await postEvent(w, expired)).status).toBe(200);
    const after = await counts(w);
    expect(after.ledger).toBe(before.ledger);
    expect(after.events).toBe(before.events + 1);
    expect(await unmatched(expired.id)).toEqual([]);
  });

  it('acknowledges an expired checkout whose client reference is a uuid that is no pledge of ours', async () => {
    w.fake.faults.set({ dropWebhooks: true });
    const session = await w.stripe.checkout.sessions.create({
      mode: 'payment',
      client_reference_id: crypto.randomUUID(),
      metadata: { pledge_id: crypto.randomUUID() },
      line_items: [{ price_data: { currency: 'usd', unit_amount: 1200, product_data: { name: 'Workshop seat' } }, quantity: 1 }],
      success_url: 'http://127.0.0.1:9/ok',
      cancel_url: 'http://127.0.0.1:9/no',
    });
    await w.stripe.checkout.sessions.expire(session.id);
    const res = await postEvent(w, eventsFor(w, session.id, ['checkout.session.expired'])[0]!);
    expect(res.status).toBe(200);
    expect(((await res.json()) as { outcome: string }).outcome).toBe('ignored');
  });

  it('acknowledges a payment of another tool and records no ledger row', async () => {
    const { pi } = await foreignCharge(3100);
    const before = await counts(w);
    for (const e of eventsFor(w, pi.id)) expect((await postEvent(w, e)).status).toBe(200);
    expect((await counts(w)).ledger).toBe(before.ledger);
  });

  it('records a refund of a charge we never saw as unmatched (200, not a retry), once per event', async () => {
    const { pi, chargeId } = await foreignCharge(4200);
    const refund = await w.stripe.refunds.create({ payment_intent: pi.id, amount: 1700 });
    const refunded = eventsFor(w, chargeId, ['charge.refunded'])[0]!;
    const created = eventsFor(w, refund.id, ['refund.created'])[0]!;
    const before = await counts(w);

    const res = await postEvent(w, refunded);
    expect(res.status).toBe(200);
    expect(await res.json()).toEqual({ received: true, outcome: 'unmatched' });
    expect((await postEvent(w, refunded)).status).toBe(200);
    expect((await postEvent(w, created)).status).toBe(200);

    const [row] = await unmatched(refunded.id);
    expect(row).toMatchObject({
      eventType: 'charge.refunded',
      objectType: 'charge',
      objectId: chargeId,
      chargeId: chargeId,
      paymentIntentId: pi.id,
      currency: 'USD',
    });
    // charge.refunded carries the charge: the amount is what has been refunded of it so far.
    expect(row!.amountMinor).toBe(1700);
    expect(row!.receivedAt).toBeInstanceOf(Date);
    const [fromRefund] = await unmatched(created.id);
    expect(fromRefund).toMatchObject({ eventType: 'refund.created', objectType: 'refund', objectId: refund.id, chargeId: chargeId });
    expect(fromRefund!.amountMinor).toBe(1700);
    expect((await counts(w)).ledger).toBe(before.ledger);
  });

  it('records a dispute of a charge we never saw as unmatched', async () => {
    const { chargeId } = await foreignCharge(5000);
    const ctl = await fetch(`${w.fake.url}/_fake/charges/${chargeId}/dispute`, {
      method: 'POST',
      headers: { 'content-type': 'application/json' },
      body: '{}',
    });
    expect(ctl.status).toBe(200);
    const opened = eventsFor(w, (await ctl.json()).id, ['charge.dispute.created'])[0]!;
    const res = await postEvent(w, opened);
    expect(res.status).toBe(200);
    const [row] = await unmatched(opened.id);
    expect(row).toMatchObject({ eventType: 'charge.dispute.created', objectType: 'dispute', chargeId: chargeId, currency: 'USD' });
    expect(row!.amountMinor).toBe(5000);
  });

  it('applies a refund of a membership charge that arrives before its invoice at once, found through the processor', async () => {
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
    const refunded = eventsFor(w, refund.charge as string, ['charge.refunded'])[0]!;

    const early = await postEvent(w, refunded);
    expect(early.status).toBe(200);
    expect(((await early.json()) as { outcome: string }).outcome).toBe('applied');
    expect(await unmatched(refunded.id)).toEqual([]);
    expect((await postEvent(w, invoicePaid)).status).toBe(200);
    expect((await ledgerOf(w, res.body.pledge.id)).map((l) => [l.kind, l.amountMinor, l.processorInvoiceId !== null])).toEqual([
      ['charge', 800, true],
      ['fee', -53, true],
      ['refund', -800, false],
    ]);
    expect((await pledgeRow(w, res.body.pledge.id)).state).toBe('refunded');
  });
});
