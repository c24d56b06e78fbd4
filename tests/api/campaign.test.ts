import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq, sql } from 'drizzle-orm';
import { agentFor, createTestApp, signIn, type Agent, type TestApp } from '../setup/test-app';
import { seedDemoAccounts, DEMO_PASSWORD } from '../../server/demo/accounts';
import { insertCampaign } from './pledges-fixtures';
import { pledges } from '../../server/modules/pledges/pledges.tables';
import { ledgerEntries } from '../../server/modules/ledger/ledger.tables';
import { auditLog } from '../../server/modules/audit/audit.tables';
import { tiers } from '../../server/modules/campaigns/campaigns.tables';

let t: TestApp;
let world: Awaited<ReturnType<typeof insertCampaign>>;
let outreach: Agent;
let engineer: Agent;
let backer: Agent;
let backerId: string;

beforeAll(async () => {
  t = await createTestApp({ SIGN_IN_LIMIT_PER_IP: '1000', CAMPAIGN_CACHE_MS: '0' });
  const ids = await seedDemoAccounts(t.database.db);
  backerId = ids['backer@saltmarsh.example']!;
  world = await insertCampaign(t);
  outreach = agentFor(t.app);
  engineer = agentFor(t.app);
  backer = agentFor(t.app);
  await signIn(outreach, 'outreach@saltmarsh.example', DEMO_PASSWORD);
  await signIn(engineer, 'engineer@saltmarsh.example', DEMO_PASSWORD);
  await signIn(backer, 'backer@saltmarsh.example', DEMO_PASSWORD);
});
afterAll(async () => t?.close());

async function paidPledgeRow(amountMinor: number, opts: { backer?: string | null; refundMinor?: number; tierId?: string } = {}) {
  const db = t.database.db;
  const [p] = await db
    .insert(pledges)
    .values({
      campaignId: world.campaign.id,
      tierId: opts.tierId ?? world.tier.patch.id,
      backerId: opts.backer === undefined ? backerId : opts.backer,
      kind: 'one-time',
      amountMinor,
      currency: 'USD',
      state: !opts.refundMinor ? 'paid' : opts.refundMinor >= amountMinor ? 'refunded' : 'partly_refunded',
      idempotencyKey: crypto.randomUUID(),
      paidAt: new Date(),
      publicName: 'Test backer',
    })
    .returning();
  const ch = `ch_test_${crypto.randomUUID().slice(0, 8)}`;
  await db.insert(ledgerEntries).values({
    kind: 'charge',
    amountMinor,
    currency: 'USD',
    campaignId: world.campaign.id,
    pledgeId: p!.id,
    processorObjectId: ch,
    processorChargeId: ch,
    occurredAt: new Date(),
  });
  await db.insert(ledgerEntries).values({
    kind: 'fee',
    amountMinor: -30,
    currency: 'USD',
    campaignId: world.campaign.id,
    pledgeId: p!.id,
    processorObjectId: `txn_${ch}`,
    occurredAt: new Date(),
  });
  if (opts.refundMinor) {
    await db.insert(ledgerEntries).values({
      kind: 'refund',
      amountMinor: -opts.refundMinor,
      currency: 'USD',
      campaignId: world.campaign.id,
      pledgeId: p!.id,
      processorObjectId: `re_${ch}`,
      processorChargeId: ch,
      occurredAt: new Date(),
    });
  }
  return p!;
}

describe('the public campaign', () => {
  it('shows story, tiers with remaining counts, stretch targets and progress derived from the ledger', async () => {
    const anon = agentFor(t.app);
    const empty = (await anon.get('/api/campaigns/tern-1').expect(200)).body.campaign;
    expect(empty.progress).toMatchObject({ raisedMinor: 0, goalMinor: 4_800_000, currency: 'USD', backers: 0, percent: 0, status: 'open' });
    expect(empty.progress.secondsLeft).toBeGreaterThan(29 * 86_400);
    expect(empty.progress.secondsLeft).toBeLessThanOrEqual(30 * 86_400);
    expect(empty.tiers.map((x: { title: string; remaining: number | null }) => [x.title, x.remaining])).toEqual([
      ['Mission patch', null],
      ['Sail fragment', 1],
      ['Crew membership', null],
    ]);

    await paidPledgeRow(100_000);
    await paidPledgeRow(50_000, { refundMinor: 20_000 });
    await paidPledgeRow(9_000, { backer: null });
    const full = await paidPledgeRow(3_000, { refundMinor: 3_000, backer: null });
    expect(full.id).toBeTruthy();

    const view = (await anon.get('/api/campaigns/tern-1').expect(200)).body.campaign;
    // Fees do not reduce what backers gave; refunds do. The fully refunded pledge is no longer a backer.
    expect(view.progress.raisedMinor).toBe(100_000 + 30_000 + 9_000);
    expect(view.progress.backers).toBe(2); // one account with two pledges + one anonymised pledge
    expect(view.progress.percent).toBe(Math.floor((139_000 * 100) / 4_800_000));
    expect(view.stretchTargets).toEqual([expect.objectContaining({ title: 'Second sail', amountMinor: 6_000_000, reached: false })]);

    const list = (await anon.get('/api/campaigns').expect(200)).body.campaigns;
    expect(list.map((c: { slug: string }) => c.slug)).toEqual(['tern-1']);
    expect(list[0].progress.raisedMinor).toBe(139_000);

    const backers = (await anon.get('/api/campaigns/tern-1/backers').expect(200)).body.backers;
    expect(backers.length).toBe(3);
    expect(backers.every((b: Record<string, unknown>) => !('amountMinor' in b))).toBe(true);
  });

  it('answers 404 with a code for an unknown campaign', async () => {
    const res = await agentFor(t.app).get('/api/campaigns/no-such-mission').expect(404);
    expect(res.body.error.code).toBe('campaigns.not_found');
  });
});

describe('staff edit the campaign', () => {
  it('lets outreach change the goal and story, with an audit entry; an engineer gets 403', async () => {
    const body = {
      title: 'Tern-1: sail to a higher orbit',
      summary: 'Help a 4.8 kg sail raise its own orbit.',
      story: 'A new story.',
      goalMinor: 5_000_000,
      currency: 'USD',
      startsAt: world.campaign.startsAt.toISOString(),
      endsAt: world.campaign.endsAt.toISOString(),
    };
    await engineer.patch('/api/campaigns/tern-1').set('x-csrf-token', engineer.csrf).send(body).expect(403);
    const res = await outreach.patch('/api/campaigns/tern-1').set('x-csrf-token', outreach.csrf).send(body).expect(200);
    expect(res.body.campaign).toMatchObject({ title: body.title, goalMinor: 5_000_000, story: 'A new story.' });
    const [entry] = await t.database.db.select().from(auditLog).where(eq(auditLog.action, 'campaign.updated'));
    expect(entry).toMatchObject({ subjectType: 'campaign', subjectId: world.campaign.id });
    expect((entry!.before as { goalMinor: number }).goalMinor).toBe(4_800_000);
    expect((entry!.after as { goalMinor: number }).goalMinor).toBe(5_000_000);
  });

  it('refuses a goal in fractions, an end before the start and a currency change after pledges, saying which field', async () => {
    const base = {
      title: 'Tern-1',
      goalMinor: 5_000_000,
      currency: 'USD',
      startsAt: '2027-01-01T00:00:00Z',
      endsAt: '2027-03-01T00:00:00Z',
    };
    const fraction = await outreach
      .patch('/api/campaigns/tern-1')
      .set('x-csrf-token', outreach.csrf)
      .send({ ...base, goalMinor: 48_000.5 })
      .expect(400);
    expect(fraction.body.error.details.map((d: { path: string }) => d.path)).toEqual(['body.goalMinor']);
    const backwards = await outreach
      .patch('/api/campaigns/tern-1')
      .set('x-csrf-token', outreach.csrf)
      .send({ ...base, endsAt: '2026-12-01T00:00:00Z' })
      .expect(400);
    expect(backwards.body.error.details.map((d: { path: string }) => d.path)).toEqual(['body.endsAt']);
    const currency = await outreach
      .patch('/api/campaigns/tern-1')
      .set('x-csrf-token', outreach.csrf)
      .send({ ...base, currency: 'EUR' })
      .expect(409);
    expect(currency.body.error.code).toBe('campaigns.currency_locked');
  });

  it('adds and edits tiers; a limit cannot go below the slots already taken', async () => {
    const tier = {
      title: 'Ground station tour',
      description: 'Visit the dish.',
      minAmountMinor: 50_000,
      kind: 'one-time',
      quantityLimit: 10,
      estimatedDelivery: '2027-09-01',
      position: 4,
    };
    const created = await outreach.post('/api/campaigns/tern-1/tiers').set('x-csrf-token', outreach.csrf).send(tier).expect(201);
    expect(created.body.tier).toMatchObject({ title: 'Ground station tour', remaining: 10, estimatedDelivery: '2027-09-01' });
    await t.database.db.update(tiers).set({ soldCount: 3 }).where(eq(tiers.id, created.body.tier.id));
    const below = await outreach
      .patch(`/api/campaigns/tern-1/tiers/${created.body.tier.id}`)
      .set('x-csrf-token', outreach.csrf)
      .send({ ...tier, quantityLimit: 2 })
      .expect(400);
    expect(below.body.error.code).toBe('campaigns.tier_limit_below_sold');
    const hidden = await outreach
      .patch(`/api/campaigns/tern-1/tiers/${created.body.tier.id}`)
      .set('x-csrf-token', outreach.csrf)
      .send({ ...tier, active: false })
      .expect(200);
    expect(hidden.body.tier.active).toBe(false);
    const publicView = (await agentFor(t.app).get('/api/campaigns/tern-1').expect(200)).body.campaign;
    expect(publicView.tiers.map((x: { title: string }) => x.title)).not.toContain('Ground station tour');
    const staffView = (await outreach.get('/api/campaigns/tern-1/manage').expect(200)).body.campaign;
    expect(staffView.tiers.map((x: { title: string }) => x.title)).toContain('Ground station tour');
  });

  it('replaces the stretch targets', async () => {
    const res = await outreach
      .put('/api/campaigns/tern-1/stretch-targets')
      .set('x-csrf-token', outreach.csrf)
      .send({
        targets: [
          { amountMinor: 100_000, title: 'Telemetry upgrade' },
          { amountMinor: 9_000_000, title: 'Second sail' },
        ],
      })
      .expect(200);
    expect(res.body.campaign.stretchTargets.map((s: { title: string; reached: boolean }) => [s.title, s.reached])).toEqual([
      ['Telemetry upgrade', true],
      ['Second sail', false],
    ]);
  });
});

describe('pledge input', () => {
  const pledge = (body: Record<string, unknown>) =>
    backer
      .post('/api/pledges')
      .set('x-csrf-token', backer.csrf)
      .send({ campaignSlug: 'tern-1', attemptKey: crypto.randomUUID(), ...body });

  it('refuses amounts below the tier, outside the bounds or in fractions, naming the field', async () => {
    const pledgesBefore = await t.database.db.$count(pledges);
    const below = await pledge({ tierId: world.tier.patch.id, amountMinor: 2000 }).expect(400);
    expect(below.body.error).toMatchObject({ code: 'pledges.amount_below_tier', details: [{ path: 'amountMinor' }] });
    // Money in words a backer reads, not minor units.
    expect(below.body.error.message).toMatch(/tier starts at [€$£]\d/);
    expect(below.body.error.details[0].message).not.toMatch(/minor/);
    const tiny = await pledge({ amountMinor: 50 }).expect(400);
    expect(tiny.body.error.details[0].path).toBe('body.amountMinor');
    const huge = await pledge({ amountMinor: 2_500_001 }).expect(400);
    expect(huge.body.error.details[0].path).toBe('body.amountMinor');
    const fraction = await pledge({ amountMinor: 12.5 }).expect(400);
    expect(fraction.body.error.details[0].path).toBe('body.amountMinor');
    const foreignTier = await pledge({ tierId: '00000000-0000-4000-8000-000000000000', amountMinor: 5000 }).expect(400);
    expect(foreignTier.body.error.code).toBe('pledges.tier_unknown');
    const noKey = await backer
      .post('/api/pledges')
      .set('x-csrf-token', backer.csrf)
      .send({ campaignSlug: 'tern-1', amountMinor: 5000 })
      .expect(400);
    expect(noKey.body.error.details[0].path).toBe('body.attemptKey');
    expect(await t.database.db.$count(pledges)).toBe(pledgesBefore);
  });

  it('refuses pledges to a campaign that has ended', async () => {
    await t.database.db.execute(
      sql`UPDATE campaigns SET starts_at = now() - interval '60 days', ends_at = now() - interval '1 day' WHERE slug = 'tern-1'`,
    );
    const res = await pledge({ amountMinor: 5000 }).expect(409);
    expect(res.body.error.code).toBe('pledges.campaign_ended');
    const view = (await agentFor(t.app).get('/api/campaigns/tern-1').expect(200)).body.campaign;
    expect(view.progress).toMatchObject({ status: 'ended', secondsLeft: 0 });
  });
});

describe('the ledger', () => {
  it('refuses to change or delete a row', async () => {
    const [row] = await t.database.db.select().from(ledgerEntries).limit(1);
    await expect(t.database.db.update(ledgerEntries).set({ amountMinor: 1 }).where(eq(ledgerEntries.id, row!.id))).rejects.toThrow();
    await expect(t.database.db.delete(ledgerEntries).where(eq(ledgerEntries.id, row!.id))).rejects.toThrow();
    const [again] = await t.database.db.select().from(ledgerEntries).where(eq(ledgerEntries.id, row!.id));
    expect(again!.amountMinor).toBe(row!.amountMinor);
  });

  it('is readable by finance only', async () => {
    const finance = agentFor(t.app);
    await signIn(finance, 'finance@saltmarsh.example', DEMO_PASSWORD);
    const res = await finance.get('/api/ledger').expect(200);
    expect(res.body.entries.length).toBeGreaterThan(0);
    await outreach.get('/api/ledger').expect(403);
  });
});

describe('the audit log of campaign desk edits', () => {
  const entriesOf = (subjectId: string) =>
    t.database.db.select().from(auditLog).where(eq(auditLog.subjectId, subjectId)).orderBy(auditLog.id);
  const current = async () => (await outreach.get('/api/campaigns/tern-1?all=1').expect(200)).body.campaign;

  it('records exactly the changed fields, writes nothing for a save without change, and keeps times to the second', async () => {
    // Open and close times with seconds, as a seed or an import may set them.
    const startsAt = new Date('2026-01-05T09:15:42.000Z');
    const endsAt = new Date('2027-02-01T18:00:07.000Z');
    await t.database.db.execute(sql`update campaigns set starts_at = ${startsAt}, ends_at = ${endsAt} where id = ${world.campaign.id}`);
    const c = await current();
    const body = {
      title: c.title,
      summary: c.summary,
      story: c.story,
      goalMinor: c.goalMinor,
      currency: c.currency,
      startsAt: c.startsAt,
      endsAt: c.endsAt,
    };
    const before = (await entriesOf(world.campaign.id)).length;

    await outreach.patch('/api/campaigns/tern-1').set('x-csrf-token', outreach.csrf).send(body).expect(200);
    expect(await entriesOf(world.campaign.id)).toHaveLength(before);

    const res = await outreach
      .patch('/api/campaigns/tern-1')
      .set('x-csrf-token', outreach.csrf)
      .send({ ...body, story: 'The story, told again.' })
      .expect(200);
    expect(res.body.campaign).toMatchObject({ startsAt: startsAt.toISOString(), endsAt: endsAt.toISOString() });
    const entries = await entriesOf(world.campaign.id);
    expect(entries).toHaveLength(before + 1);
    expect(entries.at(-1)).toMatchObject({
      action: 'campaign.updated',
      before: { story: c.story },
      after: { story: 'The story, told again.' },
    });
  });

  it('lists only the tier fields that changed, never ids or counts', async () => {
    const tier = {
      title: 'Dish visit',
      description: 'See the dish.',
      minAmountMinor: 40_000,
      kind: 'one-time',
      quantityLimit: 5,
      estimatedDelivery: '2027-09-01',
      position: 6,
    };
    const created = await outreach.post('/api/campaigns/tern-1/tiers').set('x-csrf-token', outreach.csrf).send(tier).expect(201);
    const id = created.body.tier.id as string;
    await outreach
      .patch(`/api/campaigns/tern-1/tiers/${id}`)
      .set('x-csrf-token', outreach.csrf)
      .send({ ...tier, minAmountMinor: 45_000, title: 'Dish visit and tea' })
      .expect(200);
    await outreach
      .patch(`/api/campaigns/tern-1/tiers/${id}`)
      .set('x-csrf-token', outreach.csrf)
      .send({ ...tier, minAmountMinor: 45_000, title: 'Dish visit and tea' })
      .expect(200);
    const entries = await entriesOf(id);
    expect(entries.map((e) => e.action)).toEqual(['tier.created', 'tier.updated']);
    expect(entries[1]).toMatchObject({
      before: { title: 'Dish visit', minAmountMinor: 40_000 },
      after: { title: 'Dish visit and tea', minAmountMinor: 45_000 },
    });
    expect(Object.keys(entries[1]!.before as object).sort()).toEqual(['minAmountMinor', 'title']);
    expect(Object.keys(entries[1]!.after as object).sort()).toEqual(['minAmountMinor', 'title']);
  });
});
