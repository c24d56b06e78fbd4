// The flight budget: outreach sets budget lines, the goal becomes their sum, and the public campaign shows each
// line paid, filling or waiting as the ledger's money pours in line by line.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { agentFor, createTestApp, signIn, type Agent, type TestApp } from '../setup/test-app';
import { seedDemoAccounts, DEMO_PASSWORD } from '../../server/demo/accounts';
import { insertCampaign } from './pledges-fixtures';
import { auditLog } from '../../server/modules/audit/audit.tables';
import { ledgerEntries } from '../../server/modules/ledger/ledger.tables';
import { pledges } from '../../server/modules/pledges/pledges.tables';
import { fillBudget } from '../../shared/flight-budget';

let t: TestApp;
let world: Awaited<ReturnType<typeof insertCampaign>>;
let outreach: Agent;

beforeAll(async () => {
  t = await createTestApp({ SIGN_IN_LIMIT_PER_IP: '1000', CAMPAIGN_CACHE_MS: '0' });
  await seedDemoAccounts(t.database.db);
  world = await insertCampaign(t);
  outreach = agentFor(t.app);
  await signIn(outreach, 'outreach@saltmarsh.example', DEMO_PASSWORD);
});
afterAll(async () => t?.close());

const lines = [
  { name: 'Launch slot', amountMinor: 300_000, reason: 'The ride up.' },
  { name: 'Ground-station time', amountMinor: 150_000, reason: 'Hearing the craft.' },
  { name: 'Spare sail', amountMinor: 50_000, reason: '' },
];

const put = (body: object) =>
  outreach.put(`/api/campaigns/${world.campaign.slug}/budget-lines`).set('x-csrf-token', outreach.csrf).send(body);

describe('filling the budget (pure)', () => {
  it('pays lines in order and marks exactly one as filling', () => {
    const filled = fillBudget(
      lines.map((l, i) => ({ ...l, id: String(i) })),
      320_000,
    );
    expect(filled.map((l) => [l.state, l.fundedMinor])).toEqual([
      ['paid', 300_000],
      ['filling', 20_000],
      ['waiting', 0],
    ]);
    expect(fillBudget([{ id: 'a', name: 'x', amountMinor: 100, reason: '' }], -5)[0]!.fundedMinor).toBe(0);
    expect(fillBudget([{ id: 'a', name: 'x', amountMinor: 100, reason: '' }], 1_000).map((l) => l.state)).toEqual(['paid']);
  });
});

describe('flight budget on the campaign', () => {
  it('makes the goal the sum of the lines and shows how far the money reaches', async () => {
    const res = await put({ lines });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    expect(res.body.campaign.goalMinor).toBe(500_000);
    const db = t.database.db;
    const [p] = await db
      .insert(pledges)
      .values({
        campaignId: world.campaign.id,
        tierId: world.tier.patch.id,
        kind: 'one-time',
        amountMinor: 320_000,
        currency: 'USD',
        state: 'paid',
        idempotencyKey: crypto.randomUUID(),
        paidAt: new Date(),
      })
      .returning();
    await db.insert(ledgerEntries).values({
      campaignId: world.campaign.id,
      pledgeId: p!.id,
      kind: 'charge',
      amountMinor: 320_000,
      currency: 'USD',
      processorObjectId: 'ch_budget_1',
      processorChargeId: 'ch_budget_1',
      occurredAt: new Date(),
    });
    const view = (await agentFor(t.app).get(`/api/campaigns/${world.campaign.slug}`).expect(200)).body.campaign;
    expect(view.budgetLines.map((l: { name: string; state: string; fundedMinor: number }) => [l.name, l.state, l.fundedMinor])).toEqual([
      ['Launch slot', 'paid', 300_000],
      ['Ground-station time', 'filling', 20_000],
      ['Spare sail', 'waiting', 0],
    ]);
    expect(view.progress.goalMinor).toBe(500_000);
  });

  it('writes no audit entry when nothing changed, one when a line did', async () => {
    const count = async () =>
      (await t.database.db.select().from(auditLog).where(eq(auditLog.action, 'campaign.budget_lines_replaced'))).length;
    const before = await count();
    expect((await put({ lines })).status).toBe(200);
    expect(await count()).toBe(before);
    expect((await put({ lines: [...lines.slice(0, 2), { ...lines[2]!, amountMinor: 60_000 }] })).status).toBe(200);
    expect(await count()).toBe(before + 1);
  });

  it('refuses a line without a name or amount, saying which line and why, and changes nothing', async () => {
    const res = await put({ lines: [lines[0], { name: 'X', amountMinor: 12.5 }] });
    expect(res.status).toBe(400);
    const paths = res.body.error.details.map((d: { path: string }) => d.path).join(' ');
    expect(paths).toContain('lines.1.name');
    expect(paths).toContain('lines.1.amountMinor');
    const view = (await agentFor(t.app).get(`/api/campaigns/${world.campaign.slug}`).expect(200)).body.campaign;
    expect(view.budgetLines).toHaveLength(3);
  });
});
