// The payments fake driven by the real SDK (stripe 23.1.0), and its hosted pages driven as a browser would.
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import { mkdtempSync, rmSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import Stripe from 'stripe';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { cardFeeMinor } from '../../fakes/payments/cards';
import { createPaymentsFake, type PaymentsFake } from '../../fakes/payments/server';

const SECRET = 'whsec_test_fake_secret';
const KEY = 'sk_test_fake_key';
const DAY = 86_400;

type Received = { body: string; signature: string };

async function startReceiver() {
  const received: Received[] = [];
  const rejected: Received[] = [];
  let failNext = 0;
  const server = http.createServer((req, res) => {
    const chunks: Buffer[] = [];
    req.on('data', (c: Buffer) => chunks.push(c));
    req.on('end', () => {
      const item = { body: Buffer.concat(chunks).toString('utf8'), signature: String(req.headers['stripe-signature'] ?? '') };
      if (failNext > 0) {
        failNext -= 1;
        rejected.push(item);
        res.writeHead(500).end('not now');
        return;
      }
      received.push(item);
      res.writeHead(200, { 'content-type': 'application/json' }).end('{"received":true}');
    });
  });
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  const port = (server.address() as AddressInfo).port;
  return {
    url: `http://127.0.0.1:${port}/hook`,
    received,
    rejected,
    failNextRequests(n: number) {
      failNext = n;
    },
    close: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}

function sdk(fake: PaymentsFake, key = KEY, extra: Partial<Stripe.StripeConfig> = {}) {
  return new Stripe(key, { host: '127.0.0.1', port: fake.port, protocol: 'http', ...extra });
}

async function control(fake: PaymentsFake, method: string, p: string, body?: unknown) {
  const res = await fetch(`${fake.url}${p}`, {
    method,
    headers: { 'content-type': 'application/json' },
    ...(body === undefined ? {} : { body: JSON.stringify(body) }),
  });
  expect(res.status, `${method} ${p}`).toBe(200);
  return res.json() as Promise<Record<string, unknown>>;
}

/** What a browser does on the hosted page: GET it, then POST the form. */
async function submitCard(pageUrl: string, fields: Record<string, string>) {
  const page = await fetch(pageUrl);
  expect(page.status).toBe(200);
  const html = await page.text();
  const action = html.match(/<form method="post" action="([^"]+)"/)?.[1];
  expect(action).toBeDefined();
  const res = await fetch(new URL(action!, pageUrl), {
    method: 'POST',
    headers: { 'content-type': 'application/x-www-form-urlencoded' },
    body: new URLSearchParams({ expiry: '12 / 34', cvc: '123', ...fields }).toString(),
    redirect: 'manual',
  });
  return { status: res.status, location: res.headers.get('location'), html: res.status === 303 ? '' : await res.text(), pageHtml: html };
}

describe('payments fake through the real SDK', () => {
  let fake: PaymentsFake;
  let receiver: Awaited<ReturnType<typeof startReceiver>>;
  let stripe: Stripe;
  let tmp: string;

  const events = () => receiver.received.map((r) => stripe.webhooks.constructEvent(r.body, r.signature, SECRET));
  const eventsOf = (type: string, objectId?: string) =>
    events().filter((e) => e.type === type && (!objectId || (e.data.object as { id?: string }).id === objectId));

  beforeAll(async () => {
    tmp = mkdtempSync(path.join(os.tmpdir(), 'payments-fake-test-'));
    receiver = await startReceiver();
    fake = await createPaymentsFake({
      port: 0,
      webhookUrl: receiver.url,
      webhookSecret: SECRET,
      apiKey: KEY,
      statePath: path.join(tmp, 'state.json'),
      autoPayouts: false,
    });
    stripe = sdk(fake);
  });

  afterAll(async () => {
    await fake?.close();
    await receiver?.close();
    rmSync(tmp, { recursive: true, force: true });
  });

  it('creates, retrieves, updates and lists customers', async () => {
    const created = await stripe.customers.create({ email: 'ada@example.test', name: 'Ada', metadata: { backerRef: 'b-1' } });
    expect(created.id).toMatch(/^cus_/);
    expect(created.lastResponse.requestId).toMatch(/^req_/);
    const got = await stripe.customers.retrieve(created.id);
    expect(got).toMatchObject({ id: created.id, email: 'ada@example.test', metadata: { backerRef: 'b-1' } });
    const updated = await stripe.customers.update(created.id, { name: 'Ada L.', metadata: { backerRef: '', tier: 'gold' } });
    expect(updated.name).toBe('Ada L.');
    expect(updated.metadata).toEqual({ tier: 'gold' });
    const listed = await stripe.customers.list({ email: 'ada@example.test' });
    expect(listed.object).toBe('list');
    expect(listed.data.map((c) => c.id)).toEqual([created.id]);
  });

  it('auto-paginates over more items than one page holds, newest first', async () => {
    const ids: string[] = [];
    for (let i = 0; i < 23; i++) ids.push((await stripe.customers.create({ email: `page-${i}@example.test` })).id);
    const firstPage = await stripe.customers.list({ limit: 5 });
    expect(firstPage.has_more).toBe(true);
    expect(firstPage.data).toHaveLength(5);
    const seen: string[] = [];
    for await (const c of stripe.customers.list({ limit: 5 })) {
      if (c.email?.startsWith('page-')) seen.push(c.id);
    }
    expect(seen).toEqual([...ids].reverse());
    const all = await stripe.customers.list({ limit: 100 }).autoPagingToArray({ limit: 1000 });
    expect(new Set(all.map((c) => c.id)).size).toBe(all.length);
  });

  it('creates one-time and monthly prices and lists them by product', async () => {
    const product = await stripe.products.create({ name: 'Sail patch' });
    const once = await stripe.prices.create({ product: product.id, currency: 'usd', unit_amount: 2500 });
    const monthly = await stripe.prices.create({
      product: product.id,
      currency: 'USD',
      unit_amount: 700,
      recurring: { interval: 'month' },
    });
    expect(once).toMatchObject({ type: 'one_time', unit_amount: 2500, currency: 'usd', recurring: null });
    expect(monthly).toMatchObject({ type: 'recurring', recurring: { interval: 'month', interval_count: 1 } });
    const again = await stripe.prices.retrieve(monthly.id, { expand: ['product'] });
    expect((again.product as Stripe.Product).name).toBe('Sail patch');
    const listed = await stripe.prices.list({ product: product.id });
    expect(listed.data.map((p) => p.id)).toEqual([monthly.id, once.id]);
    const recurringOnly = await stripe.prices.list({ product: product.id, type: 'recurring' });
    expect(recurringOnly.data.map((p) => p.id)).toEqual([monthly.id]);
  });

  it('raises the SDK typed errors', async () => {
    const missing = await stripe.customers.retrieve('cus_doesnotexist').catch((e: unknown) => e);
    expect(missing).toBeInstanceOf(Stripe.errors.StripeInvalidRequestError);
    expect(missing).toMatchObject({ statusCode: 404, code: 'resource_missing' });

    const bad = await stripe.prices
      .create({ product_data: { name: 'x' }, unit_amount: 100 } as Stripe.PriceCreateParams)
      .catch((e: unknown) => e);
    expect(bad).toBeInstanceOf(Stripe.errors.StripeInvalidRequestError);
    expect(bad).toMatchObject({ param: 'currency', code: 'parameter_missing' });

    const unknownParam = await stripe.customers.create({ colour: 'red' } as Stripe.CustomerCreateParams).catch((e: unknown) => e);
    expect(unknownParam).toMatchObject({ type: 'StripeInvalidRequestError', param: 'colour' });

    const wrongKey = await sdk(fake, 'sk_test_wrong')
      .customers.list()
      .catch((e: unknown) => e);
    expect(wrongKey).toBeInstanceOf(Stripe.errors.StripeAuthenticationError);

    const declined = await stripe.paymentIntents
      .create({ amount: 2000, currency: 'usd', payment_method: 'pm_card_chargeDeclinedInsufficientFunds', confirm: true })
      .catch((e: unknown) => e);
    expect(declined).toBeInstanceOf(Stripe.errors.StripeCardError);
    expect(declined).toMatchObject({ statusCode: 402, code: 'card_declined', decline_code: 'insufficient_funds' });
    const pi = (declined as Stripe.errors.StripeCardError).payment_intent;
    expect(pi?.status).toBe('requires_payment_method');
  });

  it('replays a request with the same idempotency key and rejects the key with other parameters', async () => {
    const key = `idem-${Date.now()}`;
    const first = await stripe.customers.create({ email: 'once@example.test' }, { idempotencyKey: key });
    const second = await stripe.customers.create({ email: 'once@example.test' }, { idempotencyKey: key });
    expect(second.id).toBe(first.id);
    const list = await stripe.customers.list({ email: 'once@example.test' });
    expect(list.data).toHaveLength(1);
    const clash = await stripe.customers.create({ email: 'other@example.test' }, { idempotencyKey: key }).catch((e: unknown) => e);
    expect(clash).toBeInstanceOf(Stripe.errors.StripeIdempotencyError);
  });

  let paidIntentId = '';

  it('takes a payment on the hosted page, redirects to success_url and sends signed events', async () => {
    const session = await stripe.checkout.sessions.create({
      mode: 'payment',
      line_items: [{ quantity: 2, price_data: { currency: 'usd', unit_amount: 2500, product_data: { name: 'Pledge: Founding backer' } } }],
      success_url: 'http://127.0.0.1:9/thanks?session={CHECKOUT_SESSION_ID}',
      cancel_url: 'http://127.0.0.1:9/back',
      customer_email: 'grace@example.test',
      client_reference_id: 'pledge-42',
      metadata: { pledgeId: '42' },
      payment_intent_data: { metadata: { pledgeId: '42' } },
    });
    expect(session).toMatchObject({ status: 'open', payment_status: 'unpaid', amount_total: 5000, currency: 'usd' });
    expect(session.url).toBe(`${fake.url}/pay/${session.id}`);

    const submitted = await submitCard(session.url!, { card_number: '4242 4242 4242 4242', name: 'Grace H' });
    expect(submitted.pageHtml).toContain('<td class="amount">$50.00</td>');
    expect(submitted.pageHtml).toContain('<button type="submit">Pay $50.00</button>');
    expect(submitted.pageHtml).toContain('href="http://127.0.0.1:9/back"');
    expect(submitted.status).toBe(303);
    expect(submitted.location).toBe(`http://127.0.0.1:9/thanks?session=${session.id}`);

    const done = await stripe.checkout.sessions.retrieve(session.id, {
      expand: ['payment_intent.latest_charge.balance_transaction', 'line_items'],
    });
    expect(done).toMatchObject({ status: 'complete', payment_status: 'paid', client_reference_id: 'pledge-42' });
    expect(done.line_items?.data[0]).toMatchObject({ quantity: 2, amount_total: 5000 });
    const pi = done.payment_intent as Stripe.PaymentIntent;
    expect(pi).toMatchObject({ status: 'succeeded', amount_received: 5000, metadata: { pledgeId: '42' } });
    const charge = pi.latest_charge as Stripe.Charge;
    const txn = charge.balance_transaction as Stripe.BalanceTransaction;
    // 2.9 % + 30¢ (REFERENCES.md §7): 5000 × 0.029 = 145, + 30 = 175
    expect(txn).toMatchObject({ amount: 5000, fee: 175, net: 4825, currency: 'usd', type: 'charge', source: charge.id });
    paidIntentId = pi.id;

    await control(fake, 'POST', '/_fake/webhooks/flush');
    const completed = eventsOf('checkout.session.completed', session.id);
    expect(completed).toHaveLength(1);
    expect(completed[0]!.data.object).toMatchObject({ metadata: { pledgeId: '42' }, payment_intent: pi.id });
    expect(eventsOf('payment_intent.succeeded', pi.id)).toHaveLength(1);
    expect(eventsOf('charge.succeeded', charge.id)).toHaveLength(1);
    const viaApi = await stripe.events.retrieve(completed[0]!.id);
    expect(viaApi.type).toBe('checkout.session.completed');

    const original = receiver.received.find((r) => r.body.includes(completed[0]!.id))!;
    const tampered = original.body.replace('"amount_total": 5000', '"amount_total": 1');
    expect(tampered).not.toBe(original.body);
    expect(() => stripe.webhooks.constructEvent(tampered, original.signature, SECRET)).toThrow(
      Stripe.errors.StripeSignatureVerificationError,
    );
    expect(() => stripe.webhooks.constructEvent(original.body, original.signature, 'whsec_other')).toThrow(
      Stripe.errors.StripeSignatureVerificationError,
    );
  });

  it('shows a decline on the page, raises payment_intent.payment_failed and lets the backer try again', async () => {
    const session = await stripe.checkout.sessions.create({
      mode: 'payment',
      line_items: [{ quantity: 1, price_data: { currency: 'usd', unit_amount: 1200, product_data: { name: 'Pledge' } } }],
      success_url: 'http://127.0.0.1:9/ok',
      cancel_url: 'http://127.0.0.1:9/cancel',
    });
    const invalidNumber = await submitCard(session.url!, { card_number: '1234 5678 9012 3456' });
    expect(invalidNumber.status).toBe(400);
    expect(invalidNumber.html).toContain('That card number is not valid.');
    expect(invalidNumber.html).toContain('aria-invalid="true"');

    const declined = await submitCard(session.url!, { card_number: '4000000000000002' });
    expect(declined.status).toBe(402);
    expect(declined.html).toContain('Your card was declined.');
    expect(declined.html).toContain('role="alert"');
    const poor = await submitCard(session.url!, { card_number: '4000000000009995' });
    expect(poor.html).toContain('insufficient funds');

    const open = await stripe.checkout.sessions.retrieve(session.id);
    expect(open.status).toBe('open');
    await control(fake, 'POST', '/_fake/webhooks/flush');
    const failed = eventsOf('payment_intent.payment_failed', open.payment_intent as string);
    expect(failed.map((e) => (e.data.object as Stripe.PaymentIntent).last_payment_error?.decline_code)).toEqual([
      'generic_decline',
      'insufficient_funds',
    ]);

    const retry = await submitCard(session.url!, { card_number: '4242424242424242' });
    expect(retry.status).toBe(303);
    expect(retry.location).toBe('http://127.0.0.1:9/ok');
    const charges = await stripe.charges.list({ payment_intent: open.payment_intent as string });
    expect(charges.data.map((c) => c.status)).toEqual(['succeeded', 'failed', 'failed']);
  });

  it('words the card page plainly: what is paid for, what is taken now and what follows', async () => {
    const product = await stripe.products.create({ name: 'Harbour sail campaign' });
    const monthly = await stripe.checkout.sessions.create({
      mode: 'subscription',
      customer_email: 'plover@example.test',
      line_items: [
        { quantity: 1, price_data: { currency: 'usd', unit_amount: 1200, product: product.id, recurring: { interval: 'month' } } },
      ],
      success_url: 'http://127.0.0.1:9/ok',
      cancel_url: 'http://127.0.0.1:9/cancel',
      subscription_data: { description: 'Harbour sail campaign — Night watch crew' },
    });
    const html = await (await fetch(monthly.url!)).text();
    expect(html).toContain('<title>Pay by card</title>');
    expect(html).toContain('Paying for <strong>Harbour sail campaign — Night watch crew</strong>');
    expect(html).toContain('<tr class="total"><td>Taken now</td><td class="amount">$12.00</td></tr>');
    expect(html).toContain('After today, $12.00 is taken every month on the same day until you stop it.');
    expect(html).toContain('<button type="submit">Pay $12.00 now, then every month</button>');
    // None of the processor's own checkout phrases.
    for (const phrase of ['Subscribe', 'subscription', 'Due today', 'Complete your payment']) expect(html).not.toContain(phrase);

    const once = await stripe.checkout.sessions.create({
      mode: 'payment',
      line_items: [{ quantity: 1, price_data: { currency: 'eur', unit_amount: 2500, product: product.id } }],
      success_url: 'http://127.0.0.1:9/ok',
      payment_intent_data: { description: 'Harbour sail campaign — Mission patch & <sticker>' },
    });
    const onceHtml = await (await fetch(once.url!)).text();
    expect(onceHtml).toContain('Paying for <strong>Harbour sail campaign — Mission patch &amp; &lt;sticker&gt;</strong>');
    expect(onceHtml).toContain('<button type="submit">Pay €25.00</button>');
    expect(onceHtml).not.toContain('then every');
    expect(onceHtml).not.toContain('id="cancel-link"');
  });

  it('refunds part of a charge, then the rest, and refuses more', async () => {
    const partial = await stripe.refunds.create({ payment_intent: paidIntentId, amount: 1000, reason: 'requested_by_customer' });
    expect(partial).toMatchObject({ amount: 1000, status: 'succeeded', payment_intent: paidIntentId });
    let charge = await stripe.charges.retrieve(partial.charge as string);
    expect(charge).toMatchObject({ amount_refunded: 1000, refunded: false });

    const tooMuch = await stripe.refunds.create({ charge: charge.id, amount: 4001 }).catch((e: unknown) => e);
    expect(tooMuch).toBeInstanceOf(Stripe.errors.StripeInvalidRequestError);
    expect(tooMuch).toMatchObject({ code: 'amount_too_large' });

    const rest = await stripe.refunds.create({ charge: charge.id });
    expect(rest.amount).toBe(4000);
    charge = await stripe.charges.retrieve(charge.id, { expand: ['refunds'] });
    expect(charge).toMatchObject({ amount_refunded: 5000, refunded: true });
    expect(charge.refunds?.data.map((r) => r.amount)).toEqual([4000, 1000]);
    const txn = await stripe.balanceTransactions.retrieve(rest.balance_transaction as string);
    expect(txn).toMatchObject({ amount: -4000, fee: 0, net: -4000, type: 'refund' });

    const again = await stripe.refunds.create({ charge: charge.id }).catch((e: unknown) => e);
    expect(again).toMatchObject({ type: 'StripeInvalidRequestError', code: 'charge_already_refunded' });

    await control(fake, 'POST', '/_fake/webhooks/flush');
    expect(eventsOf('charge.refunded', charge.id).map((e) => (e.data.object as Stripe.Charge).amount_refunded)).toEqual([1000, 5000]);
    expect(eventsOf('refund.created').map((e) => (e.data.object as Stripe.Refund).id)).toEqual(
      expect.arrayContaining([partial.id, rest.id]),
    );
  });

  it('opens a dispute after a payment with the dispute test card', async () => {
    const session = await stripe.checkout.sessions.create({
      mode: 'payment',
      line_items: [{ quantity: 1, price_data: { currency: 'usd', unit_amount: 3000, product_data: { name: 'Pledge' } } }],
      success_url: 'http://127.0.0.1:9/ok',
    });
    expect((await submitCard(session.url!, { card_number: '4000 0000 0000 0259' })).status).toBe(303);
    const paid = await stripe.checkout.sessions.retrieve(session.id, { expand: ['payment_intent'] });
    const chargeId = (paid.payment_intent as Stripe.PaymentIntent).latest_charge as string;
    const disputes = await stripe.disputes.list({ charge: chargeId });
    expect(disputes.data).toHaveLength(1);
    expect(disputes.data[0]).toMatchObject({ amount: 3000, status: 'needs_response', charge: chargeId });
    expect((await stripe.charges.retrieve(chargeId)).disputed).toBe(true);
    await control(fake, 'POST', '/_fake/webhooks/flush');
    expect(eventsOf('charge.dispute.created', disputes.data[0]!.id)).toHaveLength(1);
  });

  async function subscribe(email: string, metadata: Record<string, string>) {
    const product = await stripe.products.create({ name: 'Crew membership' });
    const price = await stripe.prices.create({ product: product.id, currency: 'usd', unit_amount: 1500, recurring: { interval: 'month' } });
    const session = await stripe.checkout.sessions.create({
      mode: 'subscription',
      line_items: [{ price: price.id, quantity: 1 }],
      success_url: 'http://127.0.0.1:9/member?cs={CHECKOUT_SESSION_ID}',
      subscription_data: { metadata },
    });
    const submitted = await submitCard(session.url!, { card_number: '4242424242424242', email });
    expect(submitted.status).toBe(303);
    const done = await stripe.checkout.sessions.retrieve(session.id, { expand: ['subscription'] });
    expect(done).toMatchObject({ status: 'complete', mode: 'subscription' });
    return { session: done, sub: done.subscription as Stripe.Subscription };
  }

  it('renews a subscription when the fake clock passes the period end', async () => {
    const { sub } = await subscribe('member@example.test', { membershipId: 'm-1' });
    expect(sub).toMatchObject({ status: 'active', metadata: { membershipId: 'm-1' }, cancel_at_period_end: false });
    const item = sub.items.data[0]!;
    const periodDays = (item.current_period_end - item.current_period_start) / DAY;
    expect(periodDays).toBeGreaterThanOrEqual(28);
    expect(periodDays).toBeLessThanOrEqual(31);

    const before = fake.clock.now();
    const advanced = await control(fake, 'POST', '/_fake/clock/advance', { seconds: 31 * DAY });
    expect(advanced.now as number).toBeGreaterThanOrEqual(before + 31 * DAY);

    const invoices = await stripe.invoices.list({ subscription: sub.id });
    expect(invoices.data.map((i) => [i.billing_reason, i.status, i.amount_paid])).toEqual([
      ['subscription_cycle', 'paid', 1500],
      ['subscription_create', 'paid', 1500],
    ]);
    const renewed = await stripe.subscriptions.retrieve(sub.id);
    expect(renewed.items.data[0]!.current_period_start).toBe(item.current_period_end);
    await control(fake, 'POST', '/_fake/webhooks/flush');
    const paid = eventsOf('invoice.paid')
      .filter((e) => (e.data.object as Stripe.Invoice).parent?.subscription_details?.subscription === sub.id)
      .sort((a, b) => a.created - b.created);
    expect(paid.map((e) => (e.data.object as Stripe.Invoice).billing_reason)).toEqual(['subscription_create', 'subscription_cycle']);

    const ending = await stripe.subscriptions.update(sub.id, { cancel_at_period_end: true });
    expect(ending.cancel_at_period_end).toBe(true);
    await fake.clock.advance(31 * DAY);
    expect((await stripe.subscriptions.retrieve(sub.id)).status).toBe('canceled');
    expect((await stripe.invoices.list({ subscription: sub.id })).data).toHaveLength(2);
  });

  it('retries a failed renewal on the 3, 5, 7 day schedule and ends the subscription after the last try', async () => {
    const { sub } = await subscribe('late@example.test', { membershipId: 'm-2' });
    await control(fake, 'POST', `/_fake/customers/${sub.customer as string}/fail-renewals`, { declineCode: 'insufficient_funds' });
    await fake.clock.advance(sub.items.data[0]!.current_period_end - fake.clock.now() + 60);
    const first = (await stripe.invoices.list({ subscription: sub.id, limit: 1 })).data[0]!;
    expect(first).toMatchObject({ status: 'open', attempt_count: 1, billing_reason: 'subscription_cycle' });
    expect(first.next_payment_attempt! - fake.clock.now()).toBeGreaterThan(3 * DAY - 120);
    expect(first.next_payment_attempt! - fake.clock.now()).toBeLessThanOrEqual(3 * DAY);
    expect((await stripe.subscriptions.retrieve(sub.id)).status).toBe('past_due');

    await fake.clock.advance(3 * DAY);
    expect((await stripe.invoices.retrieve(first.id)).attempt_count).toBe(2);
    await fake.clock.advance(5 * DAY);
    expect((await stripe.invoices.retrieve(first.id)).attempt_count).toBe(3);
    await fake.clock.advance(7 * DAY);
    const last = await stripe.invoices.retrieve(first.id);
    expect(last).toMatchObject({ attempt_count: 4, next_payment_attempt: null, status: 'open' });
    expect((await stripe.subscriptions.retrieve(sub.id)).status).toBe('canceled');

    await control(fake, 'POST', '/_fake/webhooks/flush');
    const failures = eventsOf('invoice.payment_failed', first.id).map((e) => e.data.object as Stripe.Invoice);
    expect(failures.map((i) => i.attempt_count)).toEqual([1, 2, 3, 4]);
    expect(failures.at(-1)!.next_payment_attempt).toBeNull();
    expect(eventsOf('customer.subscription.deleted', sub.id)).toHaveLength(1);
  });

  it('collects a failed renewal once the backer saves a new card on the update page', async () => {
    const { sub } = await subscribe('fixer@example.test', { membershipId: 'm-3' });
    const customerId = sub.customer as string;
    await control(fake, 'POST', `/_fake/customers/${customerId}/fail-renewals`, {});
    await fake.clock.advance(sub.items.data[0]!.current_period_end - fake.clock.now() + 60);
    const invoice = (await stripe.invoices.list({ subscription: sub.id, limit: 1 })).data[0]!;
    expect(invoice.status).toBe('open');

    const portal = await stripe.billingPortal.sessions.create({ customer: customerId, return_url: 'http://127.0.0.1:9/account' });
    expect(portal.url).toBe(`${fake.url}/billing/${portal.id}`);
    const declinedCard = await submitCard(portal.url, { card_number: '4000000000000002' });
    expect(declinedCard.status).toBe(402);
    expect(declinedCard.html).toContain('The card was not saved.');
    const saved = await submitCard(portal.url, { card_number: '4242424242424242' });
    expect(saved.status).toBe(303);
    expect(saved.location).toBe('http://127.0.0.1:9/account');

    expect(await stripe.invoices.retrieve(invoice.id)).toMatchObject({ status: 'paid', attempt_count: 2 });
    expect((await stripe.subscriptions.retrieve(sub.id)).status).toBe('active');
  });

  it('creates no subscription on a declined first payment and expires an unused checkout after a day', async () => {
    const price = await stripe.prices.create({
      product_data: { name: 'Crew membership' },
      currency: 'usd',
      unit_amount: 900,
      recurring: { interval: 'month' },
    });
    const session = await stripe.checkout.sessions.create({
      mode: 'subscription',
      line_items: [{ price: price.id, quantity: 1 }],
      success_url: 'http://127.0.0.1:9/ok',
      customer_email: 'try@example.test',
    });
    const declined = await submitCard(session.url!, { card_number: '4000000000000341' });
    expect(declined.status).toBe(402);
    expect((await stripe.checkout.sessions.retrieve(session.id)).subscription).toBeNull();
    expect((await stripe.subscriptions.list({ price: price.id, status: 'all' })).data).toHaveLength(0);
    expect((await submitCard(session.url!, { card_number: '4242424242424242' })).status).toBe(303);
    const subs = await stripe.subscriptions.list({ price: price.id });
    expect(subs.data.map((s) => s.status)).toEqual(['active']);
    const again = await fetch(session.url!);
    expect(await again.text()).toContain('This checkout is complete.');

    const unused = await stripe.checkout.sessions.create({
      mode: 'payment',
      line_items: [
        { price: (await stripe.prices.create({ product_data: { name: 'Patch' }, currency: 'usd', unit_amount: 500 })).id, quantity: 1 },
      ],
      success_url: 'http://127.0.0.1:9/ok',
    });
    await fake.clock.advance(DAY + 1);
    expect(await stripe.checkout.sessions.retrieve(unused.id)).toMatchObject({ status: 'expired', url: null });
    expect((await fetch(`${fake.url}/pay/${unused.id}`)).status).toBe(410);
  });

  it('pays out available balance grouped with its balance transactions', async () => {
    await fake.clock.advance(3 * DAY);
    const { payouts } = (await control(fake, 'POST', '/_fake/payouts/run')) as { payouts: Stripe.Payout[] };
    expect(payouts.length).toBeGreaterThan(0);
    const payout = await stripe.payouts.retrieve(payouts[0]!.id);
    expect(payout.status).toBe('paid');
    const grouped = await stripe.balanceTransactions.list({ payout: payout.id, limit: 100 }).autoPagingToArray({ limit: 10_000 });
    const covered = grouped.filter((t) => t.type !== 'payout');
    expect(covered.length).toBeGreaterThan(0);
    expect(covered.reduce((sum, t) => sum + t.net, 0)).toBe(payout.amount);
    expect(grouped.find((t) => t.type === 'payout')?.amount).toBe(-payout.amount);
    expect((await control(fake, 'POST', '/_fake/payouts/run')).payouts).toEqual([]);
    await control(fake, 'POST', '/_fake/webhooks/flush');
    expect(eventsOf('payout.paid', payout.id)).toHaveLength(1);
  });

  it('answers injected 500s, which the SDK retries under the same idempotency key', async () => {
    await control(fake, 'POST', '/_fake/faults', { failNext: 1 });
    const noRetry = sdk(fake, KEY, { maxNetworkRetries: 0 });
    const failed = await noRetry.customers.create({ email: 'fault@example.test' }).catch((e: unknown) => e);
    expect(failed).toBeInstanceOf(Stripe.errors.StripeAPIError);
    await control(fake, 'POST', '/_fake/faults', { failNext: 2 });
    const retried = await sdk(fake, KEY, { maxNetworkRetries: 2 }).customers.create({ email: 'fault@example.test' });
    expect(retried.id).toMatch(/^cus_/);
    expect((await stripe.customers.list({ email: 'fault@example.test' })).data).toHaveLength(1);

    await control(fake, 'POST', '/_fake/faults', { dropWebhooks: true });
    const quiet = await stripe.customers.create({ email: 'quiet@example.test' });
    await control(fake, 'POST', '/_fake/webhooks/flush');
    await control(fake, 'DELETE', '/_fake/faults');
    expect(eventsOf('customer.created', quiet.id)).toHaveLength(0);
    const recorded = await stripe.events.list({ type: 'customer.created', limit: 3 });
    expect(recorded.data.map((e) => (e.data.object as Stripe.Customer).id)).toContain(quiet.id);
  });

  it('keeps its state across a restart on the same state file', async () => {
    const customer = await stripe.customers.create({ email: 'kept@example.test' }, { idempotencyKey: 'restart-key' });
    const nowBefore = fake.clock.now();
    await fake.close();
    fake = await createPaymentsFake({
      port: 0,
      webhookUrl: receiver.url,
      webhookSecret: SECRET,
      apiKey: KEY,
      statePath: path.join(tmp, 'state.json'),
      autoPayouts: false,
    });
    stripe = sdk(fake);
    expect((await stripe.customers.retrieve(customer.id)).id).toBe(customer.id);
    expect(fake.clock.now()).toBeGreaterThanOrEqual(nowBefore);
    expect(fake.clock.now() - nowBefore).toBeLessThan(60);
    const replay = await stripe.customers.create({ email: 'kept@example.test' }, { idempotencyKey: 'restart-key' });
    expect(replay.id).toBe(customer.id);
    const subs = await stripe.subscriptions.list({ status: 'all', limit: 100 });
    expect(subs.data.length).toBeGreaterThanOrEqual(3);
  });
});

describe('webhook delivery', () => {
  it('retries with backoff after the endpoint answers 500, keeping one object in order', async () => {
    const receiver = await startReceiver();
    const fake = await createPaymentsFake({
      port: 0,
      webhookUrl: receiver.url,
      webhookSecret: SECRET,
      webhookRetryDelaysMs: [50, 100, 200],
    });
    try {
      const stripe = sdk(fake);
      receiver.failNextRequests(2);
      const customer = await stripe.customers.create({ email: 'retry@example.test' });
      await stripe.customers.update(customer.id, { name: 'Second' });
      const deadline = Date.now() + 5000;
      // The fake marks a delivery done after the receiver has answered: wait for both to settle, not only arrive.
      const settled = () => receiver.received.length >= 2 && fake.webhooks.deliveries().every((d) => d.status !== 'pending');
      while (!settled() && Date.now() < deadline) await new Promise((r) => setTimeout(r, 20));
      const delivered = receiver.received.map((r) => stripe.webhooks.constructEvent(r.body, r.signature, SECRET));
      expect(delivered.map((e) => e.type)).toEqual(['customer.created', 'customer.updated']);
      expect(receiver.rejected.map((r) => (JSON.parse(r.body) as { type: string }).type)).toEqual(['customer.created', 'customer.created']);
      const deliveries = fake.webhooks.deliveries();
      expect(deliveries.map((d) => [d.status, d.attempts])).toEqual([
        ['delivered', 3],
        ['delivered', 1],
      ]);
    } finally {
      await fake.close();
      await receiver.close();
    }
  });

  it('gives up after the bounded number of tries', async () => {
    const receiver = await startReceiver();
    const fake = await createPaymentsFake({ port: 0, webhookUrl: receiver.url, webhookSecret: SECRET, webhookRetryDelaysMs: [20, 20] });
    try {
      receiver.failNextRequests(100);
      await sdk(fake).customers.create({ email: 'never@example.test' });
      const deadline = Date.now() + 3000;
      while (fake.webhooks.deliveries()[0]?.status === 'pending' && Date.now() < deadline) await new Promise((r) => setTimeout(r, 20));
      expect(fake.webhooks.deliveries()[0]).toMatchObject({ status: 'failed', attempts: 3, lastStatusCode: 500 });
      expect(receiver.rejected).toHaveLength(3);
    } finally {
      await fake.close();
      await receiver.close();
    }
  });
});

describe('card fee', () => {
  it('is 2.9 % + 30¢ with the percentage rounded half up to a cent', () => {
    // The processor's US card pricing (REFERENCES.md §7).
    expect(cardFeeMinor(5000)).toBe(175);
    expect(cardFeeMinor(1050)).toBe(60); // 30.45 → 30, + 30
    expect(cardFeeMinor(1550)).toBe(75); // 44.95 → 45, + 30
    expect(cardFeeMinor(50)).toBe(31); // 1.45 → 1, + 30
    expect(cardFeeMinor(0)).toBe(30);
    expect(() => cardFeeMinor(10.5)).toThrow(/integer/);
  });
});
