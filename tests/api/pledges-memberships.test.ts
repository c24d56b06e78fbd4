import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import {
  CARDS,
  createWorld,
  ledgerOf,
  payOnHostedPage,
  pledgeRow,
  settle,
  signedInAgent,
  startPledge,
  type World,
} from './pledges-fixtures';
import type { Agent } from '../setup/test-app';

let w: World;
beforeAll(async () => {
  w = await createWorld();
}, 60_000);
afterAll(async () => w?.close());

const DAY = 86_400;

async function subscribe(agent: Agent, amountMinor = 800) {
  const res = await startPledge(agent, { tierId: w.tier.crew.id, amountMinor });
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  const paid = await payOnHostedPage(res.body.checkoutUrl, CARDS.ok);
  expect(paid.status).toBe(303);
  await settle(w);
  const memberships = (await agent.get('/api/my-support/memberships').expect(200)).body.memberships as {
    id: string;
    pledgeId: string;
    status: string;
    currentPeriodEnd: string;
    cancelAtPeriodEnd: boolean;
  }[];
  const membership = memberships.find((m) => m.pledgeId === res.body.pledge.id)!;
  return { pledgeId: res.body.pledge.id as string, membership };
}

describe('crew memberships (monthly tiers)', () => {
  it('start as a subscription: first payment in the ledger, membership active with a period end a month out', async () => {
    const { pledgeId, membership } = await subscribe(w.backer);
    expect((await pledgeRow(w, pledgeId)).state).toBe('paid');
    expect(membership.status).toBe('active');
    const periodEnd = Date.parse(membership.currentPeriodEnd);
    expect(periodEnd - Date.now()).toBeGreaterThan(27 * DAY * 1000);
    expect(periodEnd - Date.now()).toBeLessThan(32 * DAY * 1000);
    const ledger = await ledgerOf(w, pledgeId);
    expect(ledger.map((l) => [l.kind, l.amountMinor])).toEqual([
      ['charge', 800],
      ['fee', -53],
    ]);
    expect(ledger[0]!.processorInvoiceId).toMatch(/^in_/);
  });

  it('confirms a monthly pledge saying it renews monthly, on the processor period end, and how to stop it', async () => {
    const agent = await signedInAgent(w, 'admin@saltmarsh.example');
    const { pledgeId, membership } = await subscribe(agent, 900);
    await w.t.flushMail();
    const mails = w.t.mail
      .messages()
      .filter((m) => [m.to].flat().includes('admin@saltmarsh.example') && /Thank you for backing/.test(m.subject));
    expect(mails).toHaveLength(1);
    // The text alternative wraps its lines; compare words.
    const text = String(mails[0]!.text).replace(/\s+/g, ' ');
    expect(text).toMatch(/renews every month/);
    // The date in the mail is the processor's own period end, read back through the SDK from the fake.
    const sub = await w.stripe.subscriptions.retrieve((await pledgeRow(w, pledgeId)).subscriptionId!);
    const periodEnd = new Date(sub.items.data[0]!.current_period_end * 1000);
    expect(periodEnd.toISOString()).toBe(membership.currentPeriodEnd);
    // en-GB long date, 24-hour time, UTC: "3 January 2027 at 09:04 UTC" (CLDR en-GB patterns, from memory).
    const months = 'January February March April May June July August September October November December'.split(' ');
    const hhmm = `${String(periodEnd.getUTCHours()).padStart(2, '0')}:${String(periodEnd.getUTCMinutes()).padStart(2, '0')}`;
    const shown = `${periodEnd.getUTCDate()} ${months[periodEnd.getUTCMonth()]} ${periodEnd.getUTCFullYear()} at ${hhmm} UTC`;
    expect(text).toContain(`The next renewal is on ${shown}`);
    expect(text).toContain(`${w.baseUrl}/my-support/memberships`);
    expect(text).toMatch(/stop it at any time/);

    // A one-time pledge's confirmation says nothing about renewing.
    const once = await startPledge(agent, { tierId: w.tier.patch.id, amountMinor: w.tier.patch.minAmountMinor });
    expect(once.status, JSON.stringify(once.body)).toBe(201);
    expect((await payOnHostedPage(once.body.checkoutUrl, CARDS.ok)).status).toBe(303);
    await settle(w);
    await w.t.flushMail();
    const all = w.t.mail
      .messages()
      .filter((m) => [m.to].flat().includes('admin@saltmarsh.example') && /Thank you for backing/.test(m.subject));
    expect(all).toHaveLength(2);
    expect(String(all.find((m) => m !== mails[0])!.text)).not.toMatch(/renew/i);
  });

  it('renews when the fake clock passes the period end: a second charge lands in the ledger', async () => {
    const agent = await signedInAgent(w, 'engineer@saltmarsh.example');
    const { pledgeId, membership } = await subscribe(agent, 1200);
    await w.fake.clock.advance(31 * DAY);
    await settle(w);
    const charges = (await ledgerOf(w, pledgeId)).filter((l) => l.kind === 'charge');
    expect(charges.map((c) => c.amountMinor)).toEqual([1200, 1200]);
    expect(new Set(charges.map((c) => c.processorInvoiceId)).size).toBe(2);
    const after = (await agent.get('/api/my-support/memberships').expect(200)).body.memberships.find(
      (m: { id: string }) => m.id === membership.id,
    );
    expect(Date.parse(after.currentPeriodEnd)).toBeGreaterThan(Date.parse(membership.currentPeriodEnd));
    const view = (await agent.get(`/api/pledges/${pledgeId}`).expect(200)).body.pledge;
    expect(view.paidMinor).toBe(2400);
  });

  it('e-mails the backer an update-card link when a renewal fails, and the link opens the processor card page', async () => {
    const agent = await signedInAgent(w, 'finance@saltmarsh.example');
    const { pledgeId, membership } = await subscribe(agent);
    const row = await pledgeRow(w, pledgeId);
    w.fake.customers.failRenewals(row.processorCustomerId!, true, 'insufficient_funds');
    const renewalMails = async () =>
      (await w.t.flushMail(), w.t.mail.messages()).filter(
        (m) => [m.to].flat().includes('finance@saltmarsh.example') && /could not be renewed/.test(m.subject),
      );
    expect(await renewalMails()).toHaveLength(0);

    await w.fake.clock.advance(31 * DAY);
    await settle(w);

    const failed = await renewalMails();
    expect(failed).toHaveLength(1);
    expect(String(failed[0]!.html)).toContain(`${w.baseUrl}/my-support/memberships/${membership.id}/card`);
    expect(String(failed[0]!.html)).toMatch(/try again on/i);
    // The retry date in the mail is the processor's next attempt on the open renewal invoice.
    const open = await w.stripe.invoices.list({ customer: row.processorCustomerId!, status: 'open' });
    expect(open.data).toHaveLength(1);
    const nextAttempt = new Date(open.data[0]!.next_payment_attempt! * 1000);
    const months = 'January February March April May June July August September October November December'.split(' ');
    const hhmm = `${String(nextAttempt.getUTCHours()).padStart(2, '0')}:${String(nextAttempt.getUTCMinutes()).padStart(2, '0')}`;
    expect(String(failed[0]!.text).replace(/\s+/g, ' ')).toContain(
      `We will try again on ${nextAttempt.getUTCDate()} ${months[nextAttempt.getUTCMonth()]} ${nextAttempt.getUTCFullYear()} at ${hhmm} UTC.`,
    );
    const { rows: queued } = await w.t.database.pool.query(
      `select data->>'nextAttemptAt' as at from mail_queue where template = 'renewal-failed' and to_address = $1`,
      ['finance@saltmarsh.example'],
    );
    expect(queued.map((r: { at: string }) => Date.parse(r.at))).toEqual([nextAttempt.getTime()]);

    const status = (await agent.get('/api/my-support/memberships').expect(200)).body.memberships.find(
      (m: { id: string }) => m.id === membership.id,
    ).status;
    expect(status).toBe('past_due');
    expect((await ledgerOf(w, pledgeId)).filter((l) => l.kind === 'charge')).toHaveLength(1);

    await agent.token();
    const card = await agent.post(`/api/my-support/memberships/${membership.id}/card`).set('x-csrf-token', agent.csrf).expect(200);
    expect(card.body.url).toMatch(new RegExp(`^${w.fake.url}/billing/bps_`));
    const page = await fetch(card.body.url);
    expect(page.status).toBe(200);
    expect(await page.text()).toMatch(/Update your card/);
  });

  it('cancels at the end of the period from my support, and ends when the clock passes it', async () => {
    const agent = await signedInAgent(w, 'outreach@saltmarsh.example');
    const { pledgeId, membership } = await subscribe(agent);
    const cancel = await agent.post(`/api/my-support/memberships/${membership.id}/cancel`).set('x-csrf-token', agent.csrf).expect(200);
    expect(cancel.body.membership).toMatchObject({ cancelAtPeriodEnd: true, status: 'active' });

    const stranger = await agent.post(`/api/my-support/memberships/${membership.id}/cancel`);
    expect(stranger.status).toBe(403); // no CSRF token
    const other = await w.backer.post(`/api/my-support/memberships/${membership.id}/cancel`).set('x-csrf-token', w.backer.csrf);
    expect(other.status).toBe(404);

    await w.fake.clock.advance(32 * DAY);
    await settle(w);
    const after = (await agent.get('/api/my-support/memberships').expect(200)).body.memberships.find(
      (m: { id: string }) => m.id === membership.id,
    );
    expect(after.status).toBe('canceled');
    expect((await ledgerOf(w, pledgeId)).filter((l) => l.kind === 'charge')).toHaveLength(1);
  });
});

describe('refunds', () => {
  it('turn a refund event into a ledger refund row; the pledge is partly then fully refunded and progress falls', async () => {
    const res = await startPledge(w.backer, { tierId: w.tier.patch.id, amountMinor: 10_000 });
    await payOnHostedPage(res.body.checkoutUrl, CARDS.ok);
    await settle(w);
    const raised = async () => (await w.backer.get('/api/campaigns/tern-1').expect(200)).body.campaign.progress.raisedMinor as number;
    const before = await raised();
    const pi = (await pledgeRow(w, res.body.pledge.id)).paymentIntentId!;

    await w.stripe.refunds.create({ payment_intent: pi, amount: 4000 });
    await settle(w);
    expect((await pledgeRow(w, res.body.pledge.id)).state).toBe('partly_refunded');
    expect(await raised()).toBe(before - 4000);

    await w.stripe.refunds.create({ payment_intent: pi });
    await settle(w);
    const row = await pledgeRow(w, res.body.pledge.id);
    expect(row.state).toBe('refunded');
    const ledger = await ledgerOf(w, row.id);
    expect(ledger.filter((l) => l.kind === 'refund').map((l) => l.amountMinor)).toEqual([-4000, -6000]);
    expect(ledger.filter((l) => l.kind === 'refund').every((l) => /^re_/.test(l.processorObjectId))).toBe(true);
    expect(await raised()).toBe(before - 10_000);
    const view = (await w.backer.get(`/api/pledges/${row.id}`).expect(200)).body.pledge;
    expect(view).toMatchObject({ state: 'refunded', paidMinor: 10_000, refundedMinor: 10_000 });
  });
});

describe('payouts', () => {
  it('records a payout as a negative ledger row without a pledge', async () => {
    await w.fake.clock.advance(3 * DAY);
    const payouts = w.fake.payouts.run();
    expect(payouts.length).toBeGreaterThan(0);
    await settle(w);
    const { ledgerEntries } = await import('../../server/modules/ledger/ledger.tables');
    const { eq } = await import('drizzle-orm');
    const rows = await w.t.database.db.select().from(ledgerEntries).where(eq(ledgerEntries.kind, 'payout'));
    expect(rows.map((r) => [r.processorObjectId, r.amountMinor])).toEqual(payouts.map((p) => [p.id, -p.amount]));
    expect(rows.every((r) => r.pledgeId === null)).toBe(true);
  });
});
