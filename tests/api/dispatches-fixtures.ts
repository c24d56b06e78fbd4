import { randomBytes } from 'node:crypto';
import { mkdtempSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import type { Db } from '../../server/db/client';
import { accounts, emailPreferences } from '../../server/modules/accounts/accounts.tables';
import { memberships, pledges } from '../../server/modules/pledges/pledges.tables';
import { snapshots, spacecraft } from '../../server/modules/orbit/orbit.tables';
import type { SnapshotData } from '../../shared/charts/snapshot-chart';
import { createTestApp, agentFor, signIn, type Agent, type TestApp } from '../setup/test-app';
import { insertCampaign } from './pledges-fixtures';
import { DEMO_PASSWORD, seedDemoAccounts } from '../../server/demo/accounts';

export const uploadsDir = () => mkdtempSync(path.join(os.tmpdir(), 'lightkeel-uploads-'));

export async function dispatchDesk(env: Record<string, string> = {}) {
  const t: TestApp = await createTestApp({ SIGN_IN_LIMIT_PER_IP: '1000', UPLOADS_DIR: uploadsDir(), ...env });
  await seedDemoAccounts(t.database.db);
  const outreach = agentFor(t.app);
  await signIn(outreach, 'outreach@saltmarsh.example', DEMO_PASSWORD);
  return { t, outreach };
}

export async function as(t: TestApp, email: string, password = DEMO_PASSWORD): Promise<Agent> {
  const a = agentFor(t.app);
  await signIn(a, email, password);
  return a;
}

/** The shared test campaign (pledges-fixtures) under a fresh slug; its one-time tiers are a patch and a sail fragment. */
export async function insertTiers(t: TestApp) {
  const { campaign, tier } = await insertCampaign(t, `tern-1-${randomBytes(3).toString('hex')}`);
  return { campaignId: campaign.id, patch: tier.patch, fragment: tier.limited, crew: tier.crew };
}

type Member = { email: string; tierId?: string; pledgeState?: 'paid' | 'refunded' | 'failed'; crewStatus?: string; dispatches?: boolean };

let seq = 0;
/** Inserts an account and what it backed, straight into the tables (the pledge flow has its own tests). */
export async function insertMember(db: Db, campaignId: string, m: Member): Promise<string> {
  const [a] = await db
    .insert(accounts)
    .values({ email: m.email, displayName: m.email.split('@')[0]! })
    .returning();
  if (m.tierId || m.pledgeState) {
    const kind = m.crewStatus ? ('monthly' as const) : ('one-time' as const);
    const [p] = await db
      .insert(pledges)
      .values({
        campaignId,
        tierId: m.tierId ?? null,
        backerId: a!.id,
        kind,
        amountMinor: 2500,
        currency: 'USD',
        state: m.pledgeState ?? 'paid',
        idempotencyKey: `fixture-${++seq}-${randomBytes(4).toString('hex')}`,
      })
      .returning();
    if (m.crewStatus) {
      await db.insert(memberships).values({
        pledgeId: p!.id,
        backerId: a!.id,
        tierId: m.tierId ?? null,
        subscriptionId: `sub_fixture_${seq}_${randomBytes(4).toString('hex')}`,
        customerId: `cus_fixture_${seq}`,
        status: m.crewStatus,
      });
    }
  }
  if (m.dispatches === false) await db.insert(emailPreferences).values({ accountId: a!.id, dispatches: false });
  return a!.id;
}

/** Many members at once (one-time backers of a tier), for the fan-out tests and the bench. */
export async function insertManyBackers(db: Db, campaignId: string, tierId: string, n: number, prefix: string) {
  const made = await db.execute<{ id: string }>(
    `insert into accounts (email, display_name)
       select '${prefix}-' || g || '@members.example', 'Member ' || g from generate_series(1, ${n}) g returning id` as never,
  );
  const ids = (made as unknown as { rows: { id: string }[] }).rows.map((r) => r.id);
  await db.execute(
    `insert into pledges (campaign_id, tier_id, backer_id, kind, amount_minor, currency, state, idempotency_key)
       select '${campaignId}', '${tierId}', a.id, 'one-time', 2500, 'USD', 'paid', 'bulk-' || a.id from accounts a
        where a.email like '${prefix}-%@members.example'` as never,
  );
  return ids;
}

export const snapshotData: SnapshotData = {
  version: 1,
  spacecraftName: 'Tern-1',
  fromMs: Date.UTC(2031, 2, 1),
  toMs: Date.UTC(2031, 2, 11),
  series: ['apogee', 'perigee'],
  points: {
    epochMs: Array.from({ length: 11 }, (_, i) => Date.UTC(2031, 2, 1 + i)),
    values: {
      apogee: Array.from({ length: 11 }, (_, i) => 712 + i * 0.4),
      perigee: Array.from({ length: 11 }, (_, i) => 688 - i * 0.1),
    },
    outlier: Array.from({ length: 11 }, () => false),
  },
  sailingPeriods: [{ startMs: Date.UTC(2031, 2, 3), endMs: Date.UTC(2031, 2, 8), mode: 'raising' }],
  annotations: [],
  rateLines: {},
  rateWindow: null,
};

export async function insertSnapshot(db: Db, title = 'Apogee after sail deploy') {
  let [craft] = await db.select().from(spacecraft).limit(1);
  if (!craft) {
    [craft] = await db
      .insert(spacecraft)
      .values({
        slug: 'tern-1',
        name: 'Tern-1',
        catalogNumber: '99901',
        catalogNumberInt: 99901,
        massKg: 4.8,
        sailAreaM2: 24,
        sailReflectivity: 0.9,
        dragCoefficient: 2.2,
        dragAreaEdgeOnM2: 0.1,
      })
      .returning();
  }
  const [s] = await db
    .insert(snapshots)
    .values({
      slug: `tern-1-${randomBytes(5).toString('hex')}`,
      spacecraftId: craft!.id,
      title,
      caption: 'The sail raised apogee by about 4 km in ten days.',
      data: snapshotData,
    })
    .returning();
  return s!;
}

export function saveBody(over: Record<string, unknown> = {}) {
  return {
    title: 'First light on the sail',
    bodyMarkdown: 'The sail **opened** on day 3.\n\nRead the [mission page](/campaign).',
    audience: { kind: 'everyone', tierIds: [] },
    charts: [],
    emailOnPublish: false,
    ...over,
  };
}

export async function createDispatch(agent: Agent, over: Record<string, unknown> = {}) {
  const res = await agent.post('/api/dispatches').set('x-csrf-token', agent.csrf).send(saveBody(over));
  if (res.status !== 201) throw new Error(`create failed: ${res.status} ${JSON.stringify(res.body)}`);
  return res.body.dispatch as { id: string; slug: string; state: string; charts: { imagePath: string }[] };
}

export function transition(agent: Agent, id: string, body: Record<string, unknown>) {
  return agent.post(`/api/dispatches/${id}/transition`).set('x-csrf-token', agent.csrf).send(body);
}
