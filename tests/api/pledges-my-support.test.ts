import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import {
  CARDS,
  accountId,
  createWorld,
  ledgerOf,
  paidPledge,
  payOnHostedPage,
  pledgeRow,
  settle,
  startPledge,
  type World,
} from './pledges-fixtures';
import { agentFor, signIn, signUpAndConfirm } from '../setup/test-app';
import { auditLog } from '../../server/modules/audit/audit.tables';
import { accounts } from '../../server/modules/accounts/accounts.tables';
import { memberships } from '../../server/modules/pledges/pledges.tables';
import { sessions } from '../../server/modules/auth/auth.tables';

let w: World;
beforeAll(async () => {
  w = await createWorld();
}, 60_000);
afterAll(async () => w?.close());

async function newBacker(email: string) {
  const agent = agentFor(w.t.app);
  await agent.token();
  await signUpAndConfirm(w.t, agent, { email, password: 'a long enough password', displayName: 'Petrel Tester' });
  return agent;
}

describe('my support', () => {
  it('lists my pledges with their payments, and a receipt per payment that only I can open', async () => {
    const { id } = await paidPledge(w, w.backer, { tierId: w.tier.patch.id, amountMinor: 4200, message: 'For the sail' });
    const list = (await w.backer.get('/api/my-support/pledges').expect(200)).body.pledges;
    const mine = list.find((p: { id: string }) => p.id === id);
    expect(mine).toMatchObject({
      state: 'paid',
      amountMinor: 4200,
      currency: 'USD',
      paidMinor: 4200,
      tier: { title: 'Mission patch' },
      message: 'For the sail',
    });
    expect(mine.payments).toEqual([expect.objectContaining({ kind: 'charge', amountMinor: 4200 })]);

    const entryId = mine.payments[0].id;
    const receipt = (await w.backer.get(`/api/my-support/receipts/${entryId}`).expect(200)).body.receipt;
    expect(receipt).toMatchObject({
      kind: 'charge',
      amountMinor: 4200,
      currency: 'USD',
      campaign: { slug: 'tern-1' },
      tier: 'Mission patch',
      backerName: 'Wren Dunlin',
    });
    expect(receipt.number).toBe(`LK-${String(entryId).padStart(6, '0')}`);
    const fee = (await ledgerOf(w, id)).find((l) => l.kind === 'fee')!;
    await w.backer.get(`/api/my-support/receipts/${fee.id}`).expect(404);

    const other = await newBacker('curlew@example.org');
    await other.get(`/api/my-support/receipts/${entryId}`).expect(404);
    await other.get(`/api/pledges/${id}`).expect(404);
  });

  it('keeps e-mail choices, and a backer who turned receipts off gets no confirmation', async () => {
    const agent = await newBacker('godwit@example.org');
    expect((await agent.get('/api/my-support/email-preferences').expect(200)).body.preferences).toEqual({
      dispatches: true,
      receipts: true,
      membership: true,
    });
    const put = await agent
      .put('/api/my-support/email-preferences')
      .set('x-csrf-token', agent.csrf)
      .send({ dispatches: false, receipts: false, membership: true })
      .expect(200);
    expect(put.body.preferences).toEqual({ dispatches: false, receipts: false, membership: true });
    await agent.put('/api/my-support/email-preferences').set('x-csrf-token', agent.csrf).send({ dispatches: 'no' }).expect(400);
    const { id } = await paidPledge(w, agent, { amountMinor: 1500 });
    expect((await pledgeRow(w, id)).state).toBe('paid');
    await w.t.flushMail();
    expect(w.t.mail.messages().filter((m) => [m.to].flat().includes('godwit@example.org') && /Thank you/.test(m.subject))).toHaveLength(0);
  });

  it('downloads my data as a JSON file with my account and pledges', async () => {
    const res = await w.backer.get('/api/my-support/export').expect(200);
    expect(res.headers['content-type']).toMatch(/application\/json/);
    expect(res.headers['content-disposition']).toMatch(/attachment; filename="?lightkeel-my-data-\d{4}-\d{2}-\d{2}\.json"?/);
    const data = JSON.parse(res.text);
    expect(data).toMatchObject({ format: 'lightkeel-account-export', account: { email: 'backer@saltmarsh.example' }, roles: ['backer'] });
    expect(data.pledges.length).toBeGreaterThan(0);
    expect(data.pledges[0]).not.toHaveProperty('checkoutUrl');
  });

  it('deletes my account: pledges kept but anonymised, membership cancelled, sessions ended, audit entry written', async () => {
    const agent = await newBacker('plover@example.org');
    const id = await accountId(w, 'plover@example.org');
    const { id: pledgeId } = await paidPledge(w, agent, {
      tierId: w.tier.patch.id,
      amountMinor: 3000,
      publicName: 'Plover',
      message: 'Go!',
    });
    const crew = await startPledge(agent, { tierId: w.tier.crew.id, amountMinor: 800 });
    await payOnHostedPage(crew.body.checkoutUrl, CARDS.ok);
    await settle(w);
    const second = agentFor(w.t.app);
    await signIn(second, 'plover@example.org', 'a long enough password');
    const raisedBefore = (await w.backer.get('/api/campaigns/tern-1').expect(200)).body.campaign.progress.raisedMinor;

    const wrong = await agent
      .delete('/api/my-support/account')
      .set('x-csrf-token', agent.csrf)
      .send({ confirmEmail: 'someone@example.org' })
      .expect(400);
    expect(wrong.body.error.code).toBe('account.confirm_mismatch');
    await agent.delete('/api/my-support/account').set('x-csrf-token', agent.csrf).send({ confirmEmail: 'Plover@example.org' }).expect(204);

    const row = await pledgeRow(w, pledgeId);
    expect(row).toMatchObject({ backerId: null, publicName: null, message: null, state: 'paid' });
    expect(row.anonymisedAt).not.toBeNull();
    expect((await ledgerOf(w, pledgeId)).map((l) => l.kind)).toEqual(['charge', 'fee']);
    const [m] = await w.t.database.db.select().from(memberships).where(eq(memberships.pledgeId, crew.body.pledge.id));
    expect((await w.stripe.subscriptions.retrieve(m!.subscriptionId)).status).toBe('canceled');
    const [acct] = await w.t.database.db.select().from(accounts).where(eq(accounts.id, id));
    expect(acct!.email).not.toContain('plover');
    expect(acct!.deletedAt).not.toBeNull();
    const left = await w.t.database.db.select().from(sessions);
    expect(left.filter((s) => JSON.stringify(s.sess).includes(id))).toEqual([]);
    await agent.get('/api/my-support/pledges').expect(401);
    await second.get('/api/my-support/pledges').expect(401);
    const [audit] = await w.t.database.db.select().from(auditLog).where(eq(auditLog.action, 'account.deleted'));
    expect(audit).toMatchObject({ subjectId: id, after: { pledgesAnonymised: 2, membershipsCancelled: 1 } });
    // Their money stays in the campaign's progress.
    expect((await w.backer.get('/api/campaigns/tern-1').expect(200)).body.campaign.progress.raisedMinor).toBe(raisedBefore);
    const relogin = agentFor(w.t.app);
    await relogin.token();
    await relogin
      .post('/api/auth/sign-in')
      .set('x-csrf-token', relogin.csrf)
      .send({ email: 'plover@example.org', password: 'a long enough password' })
      .expect(401);
  });

  it('refuses to delete a staff account from my support', async () => {
    const { signedInAgent } = await import('./pledges-fixtures');
    const admin = await signedInAgent(w, 'admin@saltmarsh.example');
    const res = await admin
      .delete('/api/my-support/account')
      .set('x-csrf-token', admin.csrf)
      .send({ confirmEmail: 'admin@saltmarsh.example' })
      .expect(409);
    expect(res.body.error.code).toBe('account.staff_cannot_delete');
  });
});

async function started(pending: ReturnType<typeof startPledge>, status: number) {
  const res = await pending;
  expect(res.status, JSON.stringify(res.body)).toBe(status);
  return res;
}

describe('trying a pledge again', () => {
  it("names the campaign and the thank-you gift on the processor's card page", async () => {
    const monthly = await started(startPledge(w.backer, { tierId: w.tier.crew.id, amountMinor: 800 }), 201);
    const html = await (await fetch(monthly.body.checkoutUrl)).text();
    expect(html).toContain('Paying for <strong>Tern-1 sail test campaign — Crew membership</strong>');
    expect(html).toContain('Pay $8.00 now, then every month');
    await w.backer.post(`/api/pledges/${monthly.body.pledge.id}/cancel`).set('x-csrf-token', w.backer.csrf).expect(200);

    const noGift = await started(startPledge(w.backer, { amountMinor: 1500 }), 201);
    const noGiftHtml = await (await fetch(noGift.body.checkoutUrl)).text();
    expect(noGiftHtml).toContain('Paying for <strong>Tern-1 sail test campaign — Support without a gift</strong>');
    expect(noGiftHtml).toContain('<button type="submit">Pay $15.00</button>');
    await w.backer.post(`/api/pledges/${noGift.body.pledge.id}/cancel`).set('x-csrf-token', w.backer.csrf).expect(200);
  });

  it('starts a fresh checkout for the same gift and amount after a decline, and closes the old attempt', async () => {
    const agent = await newBacker('sanderling@example.org');
    const first = await started(startPledge(agent, { tierId: w.tier.limited.id, amountMinor: 26_000, publicName: 'Sanderling' }), 201);
    const declined = await payOnHostedPage(first.body.checkoutUrl, CARDS.declined);
    expect(declined.status).toBe(402);
    await settle(w);
    expect((await pledgeRow(w, first.body.pledge.id)).state).toBe('failed');
    // The only slot of the limited gift is still held by the declined attempt…
    await started(startPledge(w.backer, { tierId: w.tier.limited.id, amountMinor: 25_000 }), 409);

    const attemptKey = crypto.randomUUID();
    const again = await agent
      .post(`/api/pledges/${first.body.pledge.id}/again`)
      .set('x-csrf-token', agent.csrf)
      .send({ attemptKey })
      .expect(201);
    const fresh = again.body.pledge;
    expect(fresh.id).not.toBe(first.body.pledge.id);
    expect(fresh).toMatchObject({
      state: 'started',
      tier: { id: w.tier.limited.id, title: 'Sail fragment' },
      amountMinor: 26_000,
      currency: 'USD',
      kind: 'one-time',
      publicName: 'Sanderling',
    });
    expect(again.body.checkoutUrl).not.toBe(first.body.checkoutUrl);
    // …and passes to the new attempt: the old one is closed, its checkout can no longer be paid.
    const old = await pledgeRow(w, first.body.pledge.id);
    expect(old.state).toBe('abandoned');
    expect(old.slotState).not.toBe('held');
    expect((await fetch(first.body.checkoutUrl)).status).toBe(410);
    expect((await pledgeRow(w, fresh.id)).slotState).toBe('held');

    // A second click with the same key answers with the same new pledge.
    const twice = await agent
      .post(`/api/pledges/${first.body.pledge.id}/again`)
      .set('x-csrf-token', agent.csrf)
      .send({ attemptKey })
      .expect(200);
    expect(twice.body.pledge.id).toBe(fresh.id);

    const paid = await payOnHostedPage(again.body.checkoutUrl, CARDS.ok);
    expect(paid.status).toBe(303);
    await settle(w);
    expect((await pledgeRow(w, fresh.id)).state).toBe('paid');

    const paidAgain = await agent
      .post(`/api/pledges/${fresh.id}/again`)
      .set('x-csrf-token', agent.csrf)
      .send({ attemptKey: crypto.randomUUID() })
      .expect(409);
    expect(paidAgain.body.error).toMatchObject({
      code: 'pledges.not_retryable',
      message: 'This pledge went through; there is nothing to try again.',
    });
  });

  it("refuses a bad attempt key and someone else's pledge", async () => {
    const mine = await started(startPledge(w.backer, { amountMinor: 1000 }), 201);
    await w.backer.post(`/api/pledges/${mine.body.pledge.id}/cancel`).set('x-csrf-token', w.backer.csrf).expect(200);
    const bad = await w.backer
      .post(`/api/pledges/${mine.body.pledge.id}/again`)
      .set('x-csrf-token', w.backer.csrf)
      .send({ attemptKey: 'twice' })
      .expect(400);
    expect(bad.body.error.details).toEqual([{ path: 'body.attemptKey', message: 'must be a UUID made for this attempt' }]);
    const other = await newBacker('whimbrel@example.org');
    await other
      .post(`/api/pledges/${mine.body.pledge.id}/again`)
      .set('x-csrf-token', other.csrf)
      .send({ attemptKey: crypto.randomUUID() })
      .expect(404);
    const waiting = await started(startPledge(w.backer, { amountMinor: 1000 }), 201);
    const open = await w.backer
      .post(`/api/pledges/${waiting.body.pledge.id}/again`)
      .set('x-csrf-token', w.backer.csrf)
      .send({ attemptKey: crypto.randomUUID() })
      .expect(409);
    expect(open.body.error.message).toBe('This pledge is still waiting for its payment; finish paying on its checkout page.');
  });
});
