// Shared set-up for the pledge tests: the app on a real loopback port (so the payment fake can deliver
// webhooks to it), the payment fake driven through the real SDK, a campaign with tiers, and a helper that
// fills in the hosted checkout page the way a browser does.
import type { Server } from 'node:http';
import { eq } from 'drizzle-orm';
import Stripe from 'stripe';
import { createPaymentsFake, type PaymentsFake } from '../../fakes/payments/server';
import { signatureHeader } from '../../fakes/payments/webhooks';
import { freePort } from '../setup/global-setup';
import { agentFor, createTestApp, signIn, type Agent, type TestApp } from '../setup/test-app';
import { seedDemoAccounts, DEMO_PASSWORD } from '../../server/demo/accounts';
import { createStripeFromConfig } from '../../server/deps';
import { campaigns, tiers, stretchTargets } from '../../server/modules/campaigns/campaigns.tables';
import { pledges } from '../../server/modules/pledges/pledges.tables';
import { ledgerEntries } from '../../server/modules/ledger/ledger.tables';
import { processedEvents } from '../../server/modules/payments/payments.tables';
import { accounts } from '../../server/modules/accounts/accounts.tables';

export const WEBHOOK_SECRET = 'whsec_test_pledges_0123456789';
export const CARDS = {
  ok: '4242 4242 4242 4242',
  declined: '4000 0000 0000 0002',
  noFunds: '4000 0000 0000 9995',
  disputed: '4000 0000 0000 0259',
} as const;

export type World = {
  t: TestApp;
  fake: PaymentsFake;
  server: Server;
  baseUrl: string;
  stripe: Stripe;
  campaign: typeof campaigns.$inferSelect;
  tier: Record<'patch' | 'limited' | 'crew', typeof tiers.$inferSelect>;
  backer: Agent;
  close: () => Promise<void>;
};

export async function createWorld(env: Record<string, string> = {}): Promise<World> {
  const appPort = await freePort();
  const baseUrl = `http://127.0.0.1:${appPort}`;
  const fake = await createPaymentsFake({
    port: 0,
    webhookSecret: WEBHOOK_SECRET,
    webhookUrl: `${baseUrl}/api/payments/webhook`,
    apiKey: 'sk_test_pledges',
    webhookRetryDelaysMs: [100, 200, 400, 800],
    autoPayouts: false,
  });
  const t = await createTestApp({
    STRIPE_API_BASE_URL: fake.url,
    STRIPE_SECRET_KEY: 'sk_test_pledges',
    STRIPE_WEBHOOK_SECRET: WEBHOOK_SECRET,
    PUBLIC_URL: baseUrl,
    SIGN_IN_LIMIT_PER_IP: '1000',
    CAMPAIGN_CACHE_MS: '0',
    ...env,
  });
  const server = await new Promise<Server>((resolve) => {
    const s = t.app.listen(appPort, '127.0.0.1', () => resolve(s));
  });
  await seedDemoAccounts(t.database.db);
  const { campaign, tier } = await insertCampaign(t);
  const backer = agentFor(t.app);
  await signIn(backer, 'backer@saltmarsh.example', DEMO_PASSWORD);
  return {
    t,
    fake,
    server,
    baseUrl,
    stripe: createStripeFromConfig(t.config),
    campaign,
    tier,
    backer,
    close: async () => {
      await fake.close();
      server.closeAllConnections();
      await new Promise((r) => server.close(r));
      await t.close();
    },
  };
}

export async function insertCampaign(t: TestApp, slug = 'tern-1') {
  const db = t.database.db;
  const [campaign] = await db
    .insert(campaigns)
    .values({
      slug,
      title: 'Tern-1 sail test campaign',
      summary: 'A test campaign.',
      story: 'A story.',
      goalMinor: 4_800_000,
      currency: 'USD',
      startsAt: new Date(Date.now() - 86_400_000),
      endsAt: new Date(Date.now() + 30 * 86_400_000),
    })
    .returning();
  const rows = await db
    .insert(tiers)
    .values([
      { campaignId: campaign!.id, title: 'Mission patch', minAmountMinor: 2500, kind: 'one-time' as const, position: 1 },
      {
        campaignId: campaign!.id,
        title: 'Sail fragment',
        minAmountMinor: 25_000,
        kind: 'one-time' as const,
        quantityLimit: 1,
        position: 2,
      },
      { campaignId: campaign!.id, title: 'Crew membership', minAmountMinor: 800, kind: 'monthly' as const, position: 3 },
    ])
    .returning();
  await db.insert(stretchTargets).values({ campaignId: campaign!.id, amountMinor: 6_000_000, title: 'Second sail' });
  return { campaign: campaign!, tier: { patch: rows[0]!, limited: rows[1]!, crew: rows[2]! } };
}

export async function signedInAgent(w: World, email: string) {
  const agent = agentFor(w.t.app);
  await signIn(agent, email, DEMO_PASSWORD);
  return agent;
}

export async function startPledge(agent: Agent, body: Record<string, unknown>) {
  return agent
    .post('/api/pledges')
    .set('x-csrf-token', agent.csrf)
    .send({ campaignSlug: 'tern-1', attemptKey: crypto.randomUUID(), ...body });
}

/** GETs the hosted page, then POSTs its form as a browser would; answers the status and where it sends us. */
export async function payOnHostedPage(checkoutUrl: string, card: string) {
  const page = await fetch(checkoutUrl);
  const html = await page.text();
  if (page.status !== 200) throw new Error(`hosted page answered ${page.status}: ${html.slice(0, 200)}`);
  const action = /<form method="post" action="([^"]+)"/.exec(html)?.[1];
  if (!action) throw new Error('no payment form on the hosted page');
  const form = new URLSearchParams({ card_number: card, expiry: '12 / 34', cvc: '123', name: 'Wren Dunlin' });
  if (/name="email"/.test(html)) form.set('email', 'backer@saltmarsh.example');
  const res = await fetch(new URL(action, checkoutUrl), {
    method: 'POST',
    headers: { 'content-type': 'application/x-www-form-urlencoded' },
    body: form.toString(),
    redirect: 'manual',
  });
  return { status: res.status, location: res.headers.get('location'), html: await res.text() };
}

/** Delivers every webhook the fake has queued and waits for the answers. */
export async function settle(w: World) {
  for (let i = 0; i < 5; i++) {
    const r = await w.fake.webhooks.flush();
    if (r.pending === 0) return r;
  }
  return w.fake.webhooks.flush();
}

export async function pledgeRow(w: World, id: string) {
  const [row] = await w.t.database.db.select().from(pledges).where(eq(pledges.id, id));
  return row!;
}

export async function ledgerOf(w: World, pledgeId: string) {
  return w.t.database.db.select().from(ledgerEntries).where(eq(ledgerEntries.pledgeId, pledgeId)).orderBy(ledgerEntries.id);
}

export async function counts(w: World) {
  const db = w.t.database.db;
  await w.t.flushMail();
  return { ledger: await db.$count(ledgerEntries), events: await db.$count(processedEvents), mails: w.t.mail.messages().length };
}

export async function accountId(w: World, email: string) {
  const [row] = await w.t.database.db.select({ id: accounts.id }).from(accounts).where(eq(accounts.email, email));
  return row!.id;
}

/** The events the fake recorded for an object, oldest first (as the fake's state holds them). */
export function eventsFor(w: World, objectId: string, types?: string[]) {
  return w.fake.state().collections.event.filter((e) => e.data?.object?.id === objectId && (!types || types.includes(e.type)));
}

/** POSTs an event to the app ourselves, signed with the endpoint secret (or a forged one). */
export async function postEvent(w: World, event: unknown, opts: { secret?: string; body?: string } = {}) {
  const payload = opts.body ?? JSON.stringify(event);
  return fetch(`${w.baseUrl}/api/payments/webhook`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', 'stripe-signature': signatureHeader(payload, opts.secret ?? WEBHOOK_SECRET) },
    body: payload,
  });
}

/** A complete one-time pledge paid with a card; answers the pledge id after the webhooks landed. */
export async function paidPledge(w: World, agent: Agent, body: Record<string, unknown>, card: string = CARDS.ok) {
  const res = await startPledge(agent, body);
  if (res.status !== 201) throw new Error(`pledge refused: ${res.status} ${JSON.stringify(res.body)}`);
  const paid = await payOnHostedPage(res.body.checkoutUrl, card);
  await settle(w);
  return { id: res.body.pledge.id as string, checkoutUrl: res.body.checkoutUrl as string, paid };
}

export async function soldCount(w: World, tierId: string) {
  const [row] = await w.t.database.db.select({ n: tiers.soldCount }).from(tiers).where(eq(tiers.id, tierId));
  return row!.n;
}
