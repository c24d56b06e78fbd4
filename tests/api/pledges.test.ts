import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { CARDS, createWorld, ledgerOf, payOnHostedPage, pledgeRow, settle, soldCount, startPledge, type World } from './pledges-fixtures';

let w: World;
beforeAll(async () => {
  w = await createWorld();
}, 60_000);
afterAll(async () => w?.close());

describe('a one-time pledge through the hosted checkout', () => {
  it('is paid once the webhook lands: charge and fee in the ledger, one confirmation e-mail, progress moves', async () => {
    const before = (await w.backer.get('/api/campaigns/tern-1').expect(200)).body.campaign.progress;

    const res = await startPledge(w.backer, { tierId: w.tier.patch.id, amountMinor: 5000, publicName: 'Wren D.', message: 'Fair winds' });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    expect(res.body.pledge.state).toBe('started');
    expect(res.body.checkoutUrl).toMatch(new RegExp(`^${w.fake.url}/pay/cs_test_`));

    const paid = await payOnHostedPage(res.body.checkoutUrl, CARDS.ok);
    expect(paid.status).toBe(303);
    expect(paid.location).toBe(`${w.baseUrl}/pledges/${res.body.pledge.id}/thanks`);
    await settle(w);

    const pledge = (await w.backer.get(`/api/pledges/${res.body.pledge.id}`).expect(200)).body.pledge;
    expect(pledge.state).toBe('paid');
    expect(pledge.paidMinor).toBe(5000);

    const ledger = await ledgerOf(w, pledge.id);
    // 2.9 % + 30¢ on 50.00 = 1.45 + 0.30 (the processor's published US card price, REFERENCES.md §7)
    expect(ledger.map((l) => [l.kind, l.amountMinor, l.currency])).toEqual([
      ['charge', 5000, 'USD'],
      ['fee', -175, 'USD'],
    ]);
    expect(ledger[0]!.processorObjectId).toMatch(/^ch_/);
    expect(ledger[1]!.processorObjectId).toMatch(/^txn_/);

    await w.t.flushMail();
    const mails = w.t.mail.messages().filter((m) => /Thank you for backing/.test(m.subject));
    expect(mails).toHaveLength(1);
    expect([mails[0]!.to].flat()).toEqual(['backer@saltmarsh.example']);
    expect(String(mails[0]!.html)).toContain(`/my-support/receipts/${ledger[0]!.id}`);

    const after = (await w.backer.get('/api/campaigns/tern-1').expect(200)).body.campaign.progress;
    expect(after.raisedMinor).toBe(before.raisedMinor + 5000);
    expect(after.backers).toBe(before.backers + 1);
  });

  it('keeps a declined pledge unpaid with the decline reason, and gives the slot back on cancel', async () => {
    const soldBefore = await soldCount(w, w.tier.patch.id);
    const res = await startPledge(w.backer, { tierId: w.tier.patch.id, amountMinor: 3000, anonymous: true });
    expect(res.status).toBe(201);
    expect(await soldCount(w, w.tier.patch.id)).toBe(soldBefore + 1);
    const paid = await payOnHostedPage(res.body.checkoutUrl, CARDS.declined);
    expect(paid.status).toBe(402);
    expect(paid.html).toMatch(/declined/i);
    await settle(w);

    const pledge = (await w.backer.get(`/api/pledges/${res.body.pledge.id}`).expect(200)).body.pledge;
    expect(pledge.state).toBe('failed');
    expect(pledge.failureReason).toBe('Your card was declined.');
    expect(pledge.paidMinor).toBe(0);
    expect(await ledgerOf(w, pledge.id)).toEqual([]);

    const cancelled = await w.backer.post(`/api/pledges/${pledge.id}/cancel`).set('x-csrf-token', w.backer.csrf).expect(200);
    // A closed checkout outranks a decline (shared/pledge-states.ts): the attempt is over.
    expect(cancelled.body.pledge.state).toBe('abandoned');
    // …and the decline stays the reason nothing was paid, whichever of the two came first.
    expect(cancelled.body.pledge.failureReason).toBe('Your card was declined.');
    expect(cancelled.body.pledge.declined).toBe(true);
    expect((await pledgeRow(w, pledge.id)).slotState).toBe('released');
    await settle(w);
    const session = await w.stripe.checkout.sessions.retrieve((await pledgeRow(w, pledge.id)).checkoutSessionId!);
    expect(session.status).toBe('expired');
    expect(await soldCount(w, w.tier.patch.id)).toBe(soldBefore);
  });
});
