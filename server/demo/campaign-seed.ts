// The demo campaign: the Saltmarsh Orbital Society's Tern-1, in USD, with invented paid pledges. The seed
// runs before the app listens, so no webhook could land: pledges and their ledger rows are written here
// directly, marked is_demo, with processor-like ids (ch_demo_…). Live pledges go through the real flow.
import { eq, sql } from 'drizzle-orm';
import type { Seeder } from './seed';
import { campaigns, stretchTargets, tiers } from '../modules/campaigns/campaigns.tables';
import { pledges, memberships } from '../modules/pledges/pledges.tables';
import { ledgerEntries } from '../modules/ledger/ledger.tables';

const DAY_MS = 86_400_000;

const story = `Tern-1 is a 4.8 kg spacecraft with a 24 m² sail, built by volunteers of the Saltmarsh Orbital Society in a shed two fields from the sea.

Once it reaches orbit, the sail unfolds and turns to catch sunlight. The push is tiny, far less than the weight of a grain of rice, but it never stops. Tilted one way at the right moments, it lifts the orbit; turned edge-on, it rests. Our engineers will measure how much the sail raises the orbit against the thin air that pulls it down, and publish every element set they use.

What your pledge pays for: the launch slot, two ground station passes a day for a year, and the spare sail we keep in case the first one tears on the bench.

Every backer gets the dispatches: what the sail did this week, with the charts our orbit desk makes from the tracking data.`;

// Deterministic pseudo-random numbers, so every fresh demo looks the same.
function mulberry32(seed: number) {
  let a = seed;
  return () => {
    a |= 0;
    a = (a + 0x6d2b79f5) | 0;
    let t = Math.imul(a ^ (a >>> 15), 1 | a);
    t = (t + Math.imul(t ^ (t >>> 7), 61 | t)) ^ t;
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** 2.9 % + 30¢, the processor's published US card price (REFERENCES.md §7), rounded half up. */
const feeMinor = (amountMinor: number) => Math.floor((amountMinor * 290 + 5000) / 10000) + 30;

// Invented people and places only (Gullwhistle, Wrackholm): no real town, school or club.
const names = [
  'Marisol K.',
  'The Hallam family',
  null,
  'Teodor',
  'Ines & Paulo',
  null,
  'Amara O.',
  'Lindqvist crew',
  'Kit',
  null,
  'Rosalind P.',
  'Benedek',
  'Class 6B, Gullwhistle School',
  null,
  'Yusuf A.',
  'Fen',
  'Odile M.',
  null,
  'Cormac',
  'Priya & Sam',
  'Ossian',
  null,
  'Harriet W.',
  'Wrackholm amateur radio club',
];
const laterNames = [
  'Saoirse',
  'Tomasz R.',
  'Aiko',
  'Lowen',
  'Marguerite',
  'Dev & Ola',
  'Ishbel',
  'Ruairi',
  'Nkechi',
  'Halvard',
  'Wilhelmina',
  'Ptolemy K.',
];
const messages = [
  'Fly well, little sail.',
  null,
  'For my grandfather, who watched the first satellites cross the sky.',
  null,
  'Go Tern-1!',
  'Can’t wait for the first dispatch.',
  null,
  'Keep the element sets coming.',
  null,
  'From a fellow shed engineer.',
];

export const campaignSeeder: Seeder = {
  name: 'the Tern-1 campaign, tiers and demo pledges',
  isSeeded: async (db) => (await db.select({ id: campaigns.id }).from(campaigns).where(eq(campaigns.slug, 'tern-1'))).length > 0,
  run: async ({ db, accountIds, log }) => {
    const [existing] = await db.select({ id: campaigns.id }).from(campaigns).where(eq(campaigns.slug, 'tern-1'));
    if (existing) return;
    const now = Date.now();
    const [campaign] = await db
      .insert(campaigns)
      .values({
        slug: 'tern-1',
        title: 'Tern-1: a solar sail that lifts its own orbit',
        summary: 'Help a 4.8 kg spacecraft with a 24 m² sail climb on sunlight alone, and follow every metre of it.',
        story,
        goalMinor: 4_800_000,
        currency: 'USD',
        startsAt: new Date(now - 24 * DAY_MS),
        endsAt: new Date(now + 36 * DAY_MS),
      })
      .returning();
    const c = campaign!;
    const tierRows = await db
      .insert(tiers)
      .values([
        {
          campaignId: c.id,
          position: 1,
          kind: 'one-time' as const,
          minAmountMinor: 1000,
          title: 'Sail log postcard',
          description: 'A printed postcard of the sail’s first week in orbit, with its orbit drawn on the back.',
          estimatedDelivery: '2027-05-01',
        },
        {
          campaignId: c.id,
          position: 2,
          kind: 'one-time' as const,
          minAmountMinor: 3500,
          title: 'Mission patch',
          description: 'The embroidered Tern-1 patch, and your name on the campaign’s sail roll.',
          estimatedDelivery: '2027-03-01',
        },
        {
          campaignId: c.id,
          position: 3,
          kind: 'one-time' as const,
          minAmountMinor: 25_000,
          quantityLimit: 40,
          title: 'Flight-spare sail swatch',
          description: 'A framed 5 × 5 cm piece cut from the flight-spare sail, numbered and signed by the team.',
          estimatedDelivery: '2027-08-01',
        },
        {
          campaignId: c.id,
          position: 4,
          kind: 'monthly' as const,
          minAmountMinor: 800,
          title: 'Crew membership',
          description: 'Monthly support. Crew members read dispatches a day early and vote on the sail’s test manoeuvres.',
        },
        {
          campaignId: c.id,
          position: 5,
          kind: 'monthly' as const,
          minAmountMinor: 2500,
          title: 'Flight-deck crew',
          description:
            'Everything in the crew membership, plus a seat on the monthly call where the orbit desk walks through the latest element sets.',
        },
      ])
      .returning();
    const [postcard, patch, swatch, crew, deck] = tierRows as [
      (typeof tierRows)[number],
      (typeof tierRows)[number],
      (typeof tierRows)[number],
      (typeof tierRows)[number],
      (typeof tierRows)[number],
    ];
    await db.insert(stretchTargets).values([
      {
        campaignId: c.id,
        amountMinor: 6_000_000,
        title: 'A second ground station',
        description: 'A receiving dish on the far side of the estuary doubles our passes.',
      },
      {
        campaignId: c.id,
        amountMinor: 7_500_000,
        title: 'Sail-shape camera',
        description: 'A tiny camera on the boom to photograph the sail’s shape in sunlight.',
      },
    ]);

    const rand = mulberry32(1729);
    const plan: { tier: typeof postcard | null; amountMinor: number; monthly?: boolean }[] = [];
    for (let i = 0; i < 80; i++) {
      const r = rand();
      if (r < 0.2) plan.push({ tier: postcard, amountMinor: 1000 + Math.floor(rand() * 4) * 500 });
      else if (r < 0.5) plan.push({ tier: patch, amountMinor: 3500 + Math.floor(rand() * 6) * 500 });
      else if (r < 0.65) plan.push({ tier: swatch, amountMinor: 25_000 + Math.floor(rand() * 3) * 5000 });
      else if (r < 0.75) plan.push({ tier: crew, amountMinor: 800, monthly: true });
      else if (r < 0.8) plan.push({ tier: deck, amountMinor: 2500, monthly: true });
      else plan.push({ tier: null, amountMinor: 10_000 + Math.floor(rand() * 28) * 5000 });
    }

    let n = 0;
    const insertPledge = async (p: (typeof plan)[number], backerId: string | null, publicName: string | null, message: string | null) => {
      n += 1;
      const tag = String(n).padStart(4, '0');
      const paidAt = new Date(now - (23 - Math.min(22.5, n * 0.28)) * DAY_MS - Math.floor(rand() * 8) * 3_600_000);
      const [row] = await db
        .insert(pledges)
        .values({
          campaignId: c.id,
          tierId: p.tier?.id ?? null,
          backerId,
          publicName,
          message,
          kind: p.monthly ? 'monthly' : 'one-time',
          amountMinor: p.amountMinor,
          currency: 'USD',
          state: 'paid',
          slotState: p.tier ? 'held' : 'none',
          idempotencyKey: `demo-${tag}`,
          checkoutSessionId: `cs_demo_${tag}`,
          paymentIntentId: p.monthly ? null : `pi_demo_${tag}`,
          subscriptionId: p.monthly ? `sub_demo_${tag}` : null,
          paidAt,
          confirmationSentAt: paidAt,
          isDemo: true,
          createdAt: paidAt,
        })
        .returning();
      if (p.tier)
        await db
          .update(tiers)
          .set({ soldCount: sql`${tiers.soldCount} + 1` })
          .where(eq(tiers.id, p.tier.id));
      const charges = p.monthly && paidAt.getTime() < now - 20 * DAY_MS ? [paidAt, new Date(paidAt.getTime() + 30 * DAY_MS)] : [paidAt];
      for (const [i, at] of charges.entries()) {
        if (at.getTime() > now) continue;
        const id = `${tag}${i}`;
        const base = {
          currency: 'USD',
          campaignId: c.id,
          pledgeId: row!.id,
          processorChargeId: `ch_demo_${id}`,
          processorBalanceTransactionId: `txn_demo_${id}`,
          processorInvoiceId: p.monthly ? `in_demo_${id}` : null,
          isDemo: true,
        };
        await db.insert(ledgerEntries).values([
          {
            ...base,
            kind: 'charge',
            amountMinor: p.amountMinor,
            processorObjectId: `ch_demo_${id}`,
            description: p.monthly ? 'Membership payment (demo)' : 'Pledge payment (demo)',
            occurredAt: at,
          },
          {
            ...base,
            kind: 'fee',
            amountMinor: -feeMinor(p.amountMinor),
            processorObjectId: `txn_demo_${id}`,
            description: 'Processor fee on a charge (demo)',
            occurredAt: at,
          },
        ]);
      }
      if (p.monthly) {
        await db.insert(memberships).values({
          pledgeId: row!.id,
          backerId,
          tierId: p.tier!.id,
          subscriptionId: `sub_demo_${tag}`,
          customerId: `cus_demo_${tag}`,
          status: 'active',
          currentPeriodEnd: new Date(charges.at(-1)!.getTime() + 30 * DAY_MS),
          isDemo: true,
        });
      }
    };

    for (const [i, p] of plan.entries()) {
      // Past the list of names, most later backers chose to stay anonymous.
      const name = i < names.length ? names[i]! : rand() < 0.7 ? null : (laterNames[i % laterNames.length] ?? null);
      await insertPledge(p, null, name, i < 30 ? (messages[i % messages.length] ?? null) : null);
    }
    // The demo backer account has one earlier pledge of its own, so my support is not empty.
    const wren = accountIds['backer@saltmarsh.example'];
    if (wren) await insertPledge({ tier: patch, amountMinor: 4000 }, wren, 'Wren Dunlin', 'Looking forward to the first sail photo.');
    log(`  campaign tern-1 with ${tierRows.length} tiers and ${n} demo pledges`);
  },
};
