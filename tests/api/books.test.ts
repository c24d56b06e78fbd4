import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { and, asc, eq, sql } from 'drizzle-orm';
import { paidPledge, pledgeRow, settle } from './pledges-fixtures';
import { createBooksWorld, reconcile, refund, type BooksWorld } from './books-fixtures';
import { ledgerEntries } from '../../server/modules/ledger/ledger.tables';
import { receipts, monthCloses } from '../../server/modules/books/books.tables';
import { pledges } from '../../server/modules/pledges/pledges.tables';
import { accounts } from '../../server/modules/accounts/accounts.tables';
import { auditLog } from '../../server/modules/audit/audit.tables';
import { recordCharge } from '../../server/modules/pledges/pledge-ledger';
import type Stripe from 'stripe';

let w: BooksWorld;
beforeAll(async () => {
  w = await createBooksWorld();
}, 60_000);
afterAll(async () => w?.close());

describe('refunds', () => {
  it('refuses an over-refund, also when two requests race, and moves the ledger when the webhook lands', async () => {
    const { id } = await paidPledge(w, w.backer, { tierId: w.tier.patch.id, amountMinor: 2500 });
    const tooMuch = await refund(w, id, { amountMinor: 2501, reason: 'backer_asked' });
    expect(tooMuch.status).toBe(409);
    expect(tooMuch.body.error.code).toBe('books.refund_exceeds_paid');

    w.fake.faults.set({ dropWebhooks: true });
    const [a, b] = await Promise.all([
      refund(w, id, { amountMinor: 2000, reason: 'backer_asked', note: 'first click' }),
      refund(w, id, { amountMinor: 2000, reason: 'backer_asked', note: 'second click' }),
    ]);
    expect([a.status, b.status].sort()).toEqual([201, 409]);
    // Until the webhook lands the refund is pending and the ledger has not moved.
    let detail = await w.finance.get(`/api/books/pledges/${id}`);
    expect(detail.body.refunds.map((r: { state: string; amountMinor: number }) => [r.state, r.amountMinor])).toEqual([['pending', 2000]]);
    expect(detail.body.ledger.filter((e: { kind: string }) => e.kind === 'refund')).toEqual([]);
    expect(detail.body.charges[0].refundableMinor).toBe(500);
    expect((await refund(w, id, { amountMinor: 501, reason: 'goodwill' })).status).toBe(409);
    w.fake.faults.set({ dropWebhooks: false });
    for (const d of w.fake.webhooks.deliveries().filter((x) => x.status === 'dropped')) w.fake.webhooks.redeliver(d.eventId);
    await settle(w);
    detail = await w.finance.get(`/api/books/pledges/${id}`);
    expect(detail.body.refunds.map((r: { state: string }) => r.state)).toEqual(['booked']);
    expect((await refund(w, id, { amountMinor: 500, reason: 'goodwill' })).status).toBe(201);
    await settle(w);
    const rows = await w.t.database.db
      .select()
      .from(ledgerEntries)
      .where(and(eq(ledgerEntries.pledgeId, id), eq(ledgerEntries.kind, 'refund')));
    expect(rows.map((r) => r.amountMinor).sort()).toEqual([-2000, -500]);
    expect((await pledgeRow(w, id)).state).toBe('refunded');
    expect((await refund(w, id, { amountMinor: 1, reason: 'goodwill' })).status).toBe(409);

    // Receipts: the first voided, a corrected one for 500, voided in turn when nothing remained.
    const rs = await w.t.database.db.select().from(receipts).where(eq(receipts.pledgeId, id)).orderBy(asc(receipts.number));
    expect(rs.map((r) => [r.kind, r.amountMinor, r.voidedAt !== null])).toEqual([
      ['payment', 2500, true],
      ['correction', 500, true],
    ]);
    expect(rs[1]!.replacesReceiptId).toBe(rs[0]!.id);
    // The backer was told twice, the audit has both requests and the refused race was not recorded.
    await w.t.flushMail();
    const mails = w.t.mail.messages().filter((m: { subject: string }) => /refund/i.test(m.subject));
    expect(mails).toHaveLength(2);
    const audits = await w.t.database.db.select().from(auditLog).where(eq(auditLog.action, 'books.refund_requested'));
    expect(audits.filter((x) => x.subjectId === id)).toHaveLength(2);
  }, 60_000);

  it('answers a clear 400 for a bad refund body', async () => {
    const res = await refund(w, '00000000-0000-4000-8000-000000000000', { amountMinor: -5, reason: 'because' });
    expect(res.status).toBe(400);
    expect(res.body.error.details.map((d: { path: string }) => d.path).sort()).toEqual(['body.amountMinor', 'body.reason']);
  });
});

describe('receipts', () => {
  it('numbers 50 concurrent payments without gaps, also when some of their transactions roll back', async () => {
    const db = w.t.database.db;
    const [backer] = await db.select().from(accounts).where(eq(accounts.email, 'backer@saltmarsh.example'));
    const [{ start }] = (
      await db.execute<{ start: number }>(sql`select last_value::int as start from number_counters where name = 'receipt'`)
    ).rows as [{ start: number }];
    const made = await db
      .insert(pledges)
      .values(
        Array.from({ length: 50 }, (_, i) => ({
          campaignId: w.campaign.id,
          tierId: w.tier.patch.id,
          backerId: backer!.id,
          kind: 'one-time' as const,
          amountMinor: 2500,
          currency: 'USD',
          idempotencyKey: `numbering-${i}`,
        })),
      )
      .returning();
    const results = await Promise.allSettled(
      made.map((p, i) =>
        db.transaction(async (tx) => {
          const charge = {
            id: `ch_numbering${i}`,
            object: 'charge',
            status: 'succeeded',
            paid: true,
            amount: 2500,
            currency: 'usd',
            created: Math.floor(Date.now() / 1000),
            payment_intent: null,
          } as unknown as Stripe.Charge;
          await recordCharge(tx, p, { charge, balanceTransaction: null });
          // Every fifth payment's transaction fails after taking its number.
          if (i % 5 === 4) throw new Error('rolled back on purpose');
        }),
      ),
    );
    expect(results.filter((r) => r.status === 'fulfilled')).toHaveLength(40);
    const numbers = (
      await db
        .select({ n: receipts.number })
        .from(receipts)
        .where(sql`${receipts.number} > ${start}`)
        .orderBy(asc(receipts.number))
    ).map((r) => r.n);
    expect(numbers).toEqual(Array.from({ length: 40 }, (_, i) => start + 1 + i));
  }, 60_000);

  it('lets the backer download a receipt PDF and a yearly summary, and no one else', async () => {
    await w.finance
      .put('/api/books/settings')
      .set('x-csrf-token', w.finance.csrf)
      .send({ organisationName: 'Saltmarsh Orbital Society', address: '1 Harbour Row, Saltmarsh', registrationNumber: 'SOS-000123' })
      .expect(200);
    const { id } = await paidPledge(w, w.backer, { tierId: w.tier.patch.id, amountMinor: 3000 });
    const list = await w.backer.get('/api/receipts').expect(200);
    const mine = list.body.receipts.find((r: { amountMinor: number; voided: boolean }) => r.amountMinor === 3000 && !r.voided);
    expect(mine).toBeTruthy();
    const pdf = await w.backer
      .get(`/api/receipts/${mine.id}.pdf`)
      .buffer(true)
      .parse((res, cb) => {
        const chunks: Buffer[] = [];
        res.on('data', (c: Buffer) => chunks.push(c));
        res.on('end', () => cb(null, Buffer.concat(chunks)));
      });
    expect(pdf.status).toBe(200);
    expect(pdf.headers['content-type']).toBe('application/pdf');
    expect((pdf.body as Buffer).subarray(0, 5).toString()).toBe('%PDF-');
    const outreach = await (await import('./pledges-fixtures')).signedInAgent(w, 'outreach@saltmarsh.example');
    expect((await outreach.get(`/api/receipts/${mine.id}.pdf`)).status).toBe(404);
    const year = new Date().getUTCFullYear();
    const yearly = await w.backer.get(`/api/receipts/yearly/${year}.pdf`);
    expect(yearly.status).toBe(200);
    expect(yearly.headers['content-type']).toBe('application/pdf');
    void id;
  }, 60_000);
});

describe('month close', () => {
  it('closes a reconciled month; the closed month cannot change and a later row lands in the next open month', async () => {
    const now = new Date();
    const month = now.toISOString().slice(0, 7);
    const last = new Date(Date.UTC(now.getUTCFullYear(), now.getUTCMonth() + 1, 0)).toISOString().slice(0, 10);
    const refused = await w.finance.post(`/api/books/months/${month}/close`).set('x-csrf-token', w.finance.csrf);
    expect([refused.status, refused.body.error.code]).toEqual([409, 'books.not_reconciled']);
    let run = await reconcile(w, { from: `${month}-01`, to: last });
    // The receipt-numbering test wrote charges the processor never saw: resolve them as known.
    for (const f of run.findings.filter((x) => !x.resolution && x.kind !== 'payout_sums')) {
      await w.finance
        .post(`/api/books/findings/${f.id}/resolve`)
        .set('x-csrf-token', w.finance.csrf)
        .send({ action: 'acknowledge', note: 'test data' })
        .expect(200);
    }
    run = await reconcile(w, { from: `${month}-01`, to: last });
    expect(run.findings.filter((f) => !f.resolution && f.kind !== 'payout_sums')).toEqual([]);
    const closed = await w.finance.post(`/api/books/months/${month}/close`).set('x-csrf-token', w.finance.csrf);
    expect(closed.status, JSON.stringify(closed.body)).toBe(200);
    const before = closed.body.report;
    expect((await w.finance.post(`/api/books/months/${month}/close`).set('x-csrf-token', w.finance.csrf)).status).toBe(409);

    const db = w.t.database.db;
    await expect(
      db
        .update(monthCloses)
        .set({ report: {} })
        .where(eq(monthCloses.month, `${month}-01`)),
    ).rejects.toThrow();
    await expect(db.delete(monthCloses).where(eq(monthCloses.month, `${month}-01`))).rejects.toThrow();
    await expect(db.update(ledgerEntries).set({ amountMinor: 1 }).where(eq(ledgerEntries.kind, 'charge'))).rejects.toThrow();

    // A refund after the close: its row is dated now (in the closed month) but booked in the next one.
    // The 3000 payment of the receipts test, made before the close.
    const [paidBefore] = await db
      .select()
      .from(ledgerEntries)
      .where(and(eq(ledgerEntries.kind, 'charge'), eq(ledgerEntries.amountMinor, 3000)));
    if (!paidBefore) throw new Error('no 3000 payment');
    const ok = await refund(w, paidBefore.pledgeId!, { amountMinor: 100, reason: 'goodwill', chargeId: paidBefore.processorObjectId });
    expect(ok.status, JSON.stringify(ok.body)).toBe(201);
    await settle(w);
    const [late] = await db
      .select()
      .from(ledgerEntries)
      .where(and(eq(ledgerEntries.kind, 'refund'), eq(ledgerEntries.processorObjectId, ok.body.refund.processorRefundId)));
    const next = new Date(Date.UTC(now.getUTCFullYear(), now.getUTCMonth() + 1, 1)).toISOString().slice(0, 10);
    expect(late!.bookedMonth).toBe(next);
    expect(late!.processorChargeId).toBe(paidBefore.processorObjectId);

    const again = await w.finance.get(`/api/books/months/${month}`).expect(200);
    expect(again.body.report).toEqual(before);
    const live = await w.finance.get(`/api/books/months/${next.slice(0, 7)}`).expect(200);
    expect(live.body.report.lateEntries).toEqual([
      {
        entryId: late!.id,
        kind: 'refund',
        amountMinor: -100,
        currency: 'USD',
        occurredMonth: month,
        processorChargeId: paidBefore.processorObjectId,
      },
    ]);

    const csv = await w.finance.get(`/api/books/months/${month}/report.csv`).expect(200);
    expect(csv.text.split('\r\n')[0]).toBe('section,item,currency,count,amount_minor');
    const pdf = await w.finance.get(`/api/books/months/${month}/report.pdf`).expect(200);
    expect(pdf.headers['content-type']).toBe('application/pdf');

    const pub = await w.finance
      .post(`/api/books/months/${month}/publish`)
      .set('x-csrf-token', w.finance.csrf)
      .send({ campaignSlug: 'tern-1' });
    expect(pub.status, JSON.stringify(pub.body)).toBe(200);
    const publicView = await w.backer.get('/api/public/monthly-accounts/tern-1').expect(200);
    const t = before.totals.find((x: { currency: string }) => x.currency === 'USD');
    expect(publicView.body.accounts[0]).toMatchObject({ month, currency: 'USD', raisedMinor: pub.body.account.raisedMinor });
    expect(pub.body.account.raisedMinor).toBeLessThanOrEqual(t.chargesMinor);
    expect(Object.keys(publicView.body.accounts[0]).sort()).toEqual(
      ['backerCount', 'currency', 'disputesMinor', 'feesMinor', 'month', 'netMinor', 'publishedAt', 'raisedMinor', 'refundsMinor'].sort(),
    );
  }, 90_000);
});

describe('demo data', () => {
  // Last in this file: the demo row it adds would change the month totals the tests above check.
  it('refuses to refund a demo payment (written to the ledger, never made at the processor) and asks the processor nothing', async () => {
    const db = w.t.database.db;
    const [p] = await db
      .insert(pledges)
      .values({
        campaignId: w.campaign.id,
        tierId: w.tier.patch.id,
        kind: 'one-time',
        amountMinor: 2600,
        currency: w.campaign.currency,
        state: 'paid',
        idempotencyKey: 'books-test-demo-pledge',
        paidAt: new Date(),
      })
      .returning();
    await db.insert(ledgerEntries).values({
      kind: 'charge',
      amountMinor: 2600,
      currency: w.campaign.currency,
      campaignId: w.campaign.id,
      pledgeId: p!.id,
      processorObjectId: 'ch_demo_bookstest',
      processorChargeId: 'ch_demo_bookstest',
      description: 'Pledge payment (demo)',
      occurredAt: new Date(),
      isDemo: true,
    });
    const before = (await w.stripe.refunds.list({ limit: 100 })).data.length;
    const res = await refund(w, p!.id, { amountMinor: 500, reason: 'backer_asked' });
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('books.demo_payment');
    expect(res.body.error.message).toMatch(/never made at the processor/);
    expect((await w.stripe.refunds.list({ limit: 100 })).data.length).toBe(before);
    const detail = await w.finance.get(`/api/books/pledges/${p!.id}`);
    expect(detail.body.charges.map((c: { demo: boolean }) => c.demo)).toEqual([true]);
    expect(detail.body.refunds).toEqual([]);
  });
});
