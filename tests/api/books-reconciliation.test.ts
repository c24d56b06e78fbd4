// Reconciliation scenarios on the payment fake, each in its own world, with the exact report expected.
// Fees: 2.9 % + 30 minor units per card charge (the processor's published card price, common practice):
// 2500 → round_half_up(72.5) + 30 = 103. Dispute fee 1500 (the fake's default, from memory of the published
// 15.00 fee).
import { afterEach, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { CARDS, paidPledge, pledgeRow, payOnHostedPage, settle, startPledge } from './pledges-fixtures';
import { brief, createBooksWorld, reconcile, refund, type BooksWorld } from './books-fixtures';
import { ledgerEntries } from '../../server/modules/ledger/ledger.tables';
import { auditLog } from '../../server/modules/audit/audit.tables';

let w: BooksWorld | undefined;
afterEach(async () => {
  await w?.close();
  w = undefined;
});

const usd = (t: Partial<Record<string, number>>) => ({
  currency: 'USD',
  chargesMinor: 0,
  refundsMinor: 0,
  disputesMinor: 0,
  feesMinor: 0,
  netMinor: 0,
  payoutsMinor: 0,
  ...t,
});

describe('reconciliation', () => {
  it('reports a payment whose webhook was missed, records it from the processor, and is clean (and idempotent) after', async () => {
    w = await createBooksWorld();
    w.fake.faults.set({ dropWebhooks: true });
    const res = await startPledge(w.backer, { tierId: w.tier.patch.id, amountMinor: 2500 });
    expect((await payOnHostedPage(res.body.checkoutUrl, CARDS.ok)).status).toBe(303);
    w.fake.faults.set({ dropWebhooks: false });
    const pledgeId = res.body.pledge.id as string;
    const chargeId = (await w.stripe.charges.list({ limit: 1 })).data[0]!.id;

    const first = await reconcile(w);
    expect(brief(first.findings)).toEqual([
      { kind: 'missing_in_ledger', object: chargeId, processor: 2500, ledger: null, currency: 'USD' },
    ]);
    expect(first.run.summary.matched).toBe(0);
    expect(first.run.summary.totals).toEqual([usd({ chargesMinor: 2500, feesMinor: 103, netMinor: 2397 })]);

    const again = await reconcile(w);
    expect(brief(again.findings)).toEqual(brief(first.findings));

    const resolved = await w.finance
      .post(`/api/books/findings/${first.findings[0]!.id}/resolve`)
      .set('x-csrf-token', w.finance.csrf)
      .send({ action: 'record_from_processor', note: 'webhook lost during an outage' });
    expect(resolved.status, JSON.stringify(resolved.body)).toBe(200);
    const rows = await w.t.database.db.select().from(ledgerEntries).where(eq(ledgerEntries.pledgeId, pledgeId));
    expect(rows.map((r) => [r.kind, r.amountMinor]).sort()).toEqual([
      ['charge', 2500],
      ['fee', -103],
    ]);
    expect((await pledgeRow(w, pledgeId)).state).toBe('paid');
    const audits = await w.t.database.db.select().from(auditLog).where(eq(auditLog.action, 'books.finding_resolved'));
    expect(audits).toHaveLength(1);

    // Resolving twice is refused; the old run keeps showing it resolved.
    const twice = await w.finance
      .post(`/api/books/findings/${first.findings[0]!.id}/resolve`)
      .set('x-csrf-token', w.finance.csrf)
      .send({ action: 'acknowledge' });
    expect(twice.status).toBe(409);
    const after = await reconcile(w);
    expect(after.findings).toEqual([]);
    expect(after.run.summary.matched).toBe(1);
  }, 60_000);

  it('reports a one-time pledge charged twice', async () => {
    w = await createBooksWorld();
    const { id } = await paidPledge(w, w.backer, { tierId: w.tier.patch.id, amountMinor: 2500 });
    const pledge = await pledgeRow(w, id);
    const pi = await w.stripe.paymentIntents.create({
      amount: 2500,
      currency: 'usd',
      confirm: true,
      payment_method: 'pm_card_visa',
      metadata: { pledge_id: id },
      customer: pledge.processorCustomerId ?? undefined,
    });
    expect(pi.status).toBe('succeeded');
    await settle(w);
    const report = await reconcile(w);
    const charges = (await w.stripe.charges.list({ limit: 10 })).data.map((c) => c.id).reverse();
    expect(brief(report.findings)).toEqual([{ kind: 'double_charge', object: null, processor: null, ledger: 5000, currency: 'USD' }]);
    expect(report.findings[0]!.details).toEqual({ charges, count: 2 });
    expect(report.run.summary.matched).toBe(2);
    expect(report.run.summary.totals).toEqual([usd({ chargesMinor: 5000, feesMinor: 206, netMinor: 4794 })]);
  }, 60_000);

  it('matches a partial refund to the cent', async () => {
    w = await createBooksWorld();
    const { id } = await paidPledge(w, w.backer, { tierId: w.tier.patch.id, amountMinor: 2500 });
    const r = await refund(w, id, { amountMinor: 1000, reason: 'backer_asked', note: 'changed tier' });
    expect(r.status, JSON.stringify(r.body)).toBe(201);
    const report = await reconcile(w);
    expect(report.findings).toEqual([]);
    expect(report.run.summary.matched).toBe(2);
    // 2500 − 103 fee − 1000 refund (the fee is not given back on a refund) = 1397
    expect(report.run.summary.totals).toEqual([usd({ chargesMinor: 2500, refundsMinor: -1000, feesMinor: 103, netMinor: 1397 })]);
    expect((await pledgeRow(w, id)).state).toBe('partly_refunded');
  }, 60_000);

  it('matches a dispute won and one lost, with the dispute fee', async () => {
    w = await createBooksWorld();
    const won = await paidPledge(w, w.backer, { tierId: w.tier.patch.id, amountMinor: 2500 }, CARDS.disputed);
    const lost = await paidPledge(w, w.backer, { tierId: w.tier.patch.id, amountMinor: 2500 }, CARDS.disputed);
    await settle(w);
    const disputes = (await w.stripe.disputes.list({ limit: 10 })).data;
    expect(disputes).toHaveLength(2);
    const disputeOf = async (pledgeId: string) => {
      const pi = (await pledgeRow(w!, pledgeId)).paymentIntentId;
      return disputes.find((d) => d.payment_intent === pi)!;
    };
    w.fake.disputes.close((await disputeOf(won.id)).id, 'won');
    w.fake.disputes.close((await disputeOf(lost.id)).id, 'lost');
    const report = await reconcile(w);
    expect(brief(report.findings)).toEqual([]);
    // charges 2, dispute withdrawals 2, one reversal
    expect(report.run.summary.matched).toBe(5);
    // fees: 2 × 103 + 2 × 1500 = 3206; disputes: −2500 −2500 +2500 = −2500; net 5000 − 3206 − 2500 = −706
    expect(report.run.summary.totals).toEqual([usd({ chargesMinor: 5000, disputesMinor: -2500, feesMinor: 3206, netMinor: -706 })]);
    const wonRows = await w.t.database.db.select().from(ledgerEntries).where(eq(ledgerEntries.pledgeId, won.id));
    expect(wonRows.map((r) => [r.kind, r.amountMinor]).sort()).toEqual(
      [
        ['charge', 2500],
        ['dispute', -2500],
        ['dispute_reversal', 2500],
        ['fee', -103],
        ['fee', -1500],
      ].sort(),
    );
    const list = await w.finance.get('/api/books/disputes');
    expect(list.body.disputes.map((d: { status: string }) => d.status).sort()).toEqual(['lost', 'won']);
  }, 60_000);

  it('sums a payout that contains its transactions and flags one that does not', async () => {
    w = await createBooksWorld();
    await paidPledge(w, w.backer, { tierId: w.tier.patch.id, amountMinor: 2500 });
    await w.fake.clock.advance(2 * 86_400 + 60);
    const [good] = w.fake.payouts.run();
    await paidPledge(w, w.backer, { tierId: w.tier.patch.id, amountMinor: 4000 });
    await w.fake.clock.advance(2 * 86_400 + 60);
    w.fake.faults.set({ payoutSkewMinor: 7 });
    const [bad] = w.fake.payouts.run();
    const report = await reconcile(w);
    // 4000: fee round_half_up(116) + 30 = 146, net 3854; the skewed payout is 3861
    expect(brief(report.findings)).toEqual([
      { kind: 'payout_differs', object: bad!.id, processor: 3861, ledger: 3854, currency: 'USD' },
      { kind: 'payout_sums', object: good!.id, processor: 2397, ledger: 2397, currency: 'USD' },
    ]);
    expect(report.findings[0]!.details.differenceMinor).toBe(7);
    expect(report.findings[1]!.details.count).toBe(1);
    expect(report.run.summary.matched).toBe(4);
    expect(report.run.summary.totals).toEqual([usd({ chargesMinor: 6500, feesMinor: 249, netMinor: 6251, payoutsMinor: -6258 })]);
  }, 60_000);

  it('reports a charge the app never saw and a ledger row the processor does not know', async () => {
    w = await createBooksWorld();
    const pi = await w.stripe.paymentIntents.create({ amount: 1234, currency: 'eur', confirm: true, payment_method: 'pm_card_visa' });
    await settle(w);
    const chargeId = pi.latest_charge as string;
    await w.t.database.db.insert(ledgerEntries).values({
      kind: 'charge',
      amountMinor: 999,
      currency: 'USD',
      processorObjectId: 'ch_notattheprocessor',
      occurredAt: new Date(),
    });
    const report = await reconcile(w);
    expect(brief(report.findings)).toEqual([
      { kind: 'missing_at_processor', object: 'ch_notattheprocessor', processor: null, ledger: 999, currency: 'USD' },
      { kind: 'missing_in_ledger', object: chargeId, processor: 1234, ledger: null, currency: 'EUR' },
    ]);
    // 1234 × 2.9 % = 35.786 → 36, + 30 = 66
    expect(report.run.summary.totals).toEqual([{ ...usd({ chargesMinor: 1234, feesMinor: 66, netMinor: 1168 }), currency: 'EUR' }]);
    const missing = report.findings.find((f) => f.kind === 'missing_in_ledger')!;
    const ok = await w.finance
      .post(`/api/books/findings/${missing.id}/resolve`)
      .set('x-csrf-token', w.finance.csrf)
      .send({ action: 'record_from_processor' });
    expect(ok.status, JSON.stringify(ok.body)).toBe(200);
    const ghost = report.findings.find((f) => f.kind === 'missing_at_processor')!;
    const wrong = await w.finance
      .post(`/api/books/findings/${ghost.id}/resolve`)
      .set('x-csrf-token', w.finance.csrf)
      .send({ action: 'record_from_processor' });
    expect(wrong.status).toBe(400);
    const after = await reconcile(w);
    expect(brief(after.findings)).toEqual([
      { kind: 'missing_at_processor', object: 'ch_notattheprocessor', processor: null, ledger: 999, currency: 'USD' },
    ]);
    const rows = await w.t.database.db.select().from(ledgerEntries).where(eq(ledgerEntries.processorChargeId, chargeId));
    expect(rows.map((r) => [r.kind, r.amountMinor, r.currency, r.pledgeId]).sort()).toEqual([
      ['charge', 1234, 'EUR', null],
      ['fee', -66, 'EUR', null],
    ]);
  }, 60_000);
});
