import { eq } from 'drizzle-orm';
import { budgetLines, campaigns } from '../modules/campaigns/campaigns.tables';
import type { Seeder } from './seed';

// Tern-1's flight budget (invented figures for the demo); the lines add up to the campaign's 48,000.00 goal.
const lines = [
  {
    name: 'Launch slot and deployer',
    amountMinor: 2_600_000,
    reason: 'A shared ride to a sun-synchronous orbit and the spring box that sets Tern-1 free.',
  },
  { name: 'Shake and vacuum tests', amountMinor: 720_000, reason: 'Proof that the folded sail survives the launch and opens in the cold.' },
  { name: 'Ground-station time', amountMinor: 650_000, reason: 'Two years of passes to hear Tern-1 and command every sail turn.' },
  {
    name: 'Flight-spare sail and booms',
    amountMinor: 480_000,
    reason: 'A second sail to test folds on the ground while the first one flies.',
  },
  { name: 'Open reports and data', amountMinor: 350_000, reason: 'Hosting the element sets, charts and dispatches for anyone to check.' },
];

export const flightBudgetSeeder: Seeder = {
  name: 'the Tern-1 flight budget',
  isSeeded: async (db) => {
    const [c] = await db.select({ id: campaigns.id }).from(campaigns).where(eq(campaigns.slug, 'tern-1'));
    if (!c) return true; // no campaign to budget for
    return (await db.select({ id: budgetLines.id }).from(budgetLines).where(eq(budgetLines.campaignId, c.id)).limit(1)).length > 0;
  },
  run: async ({ db }) => {
    const [c] = await db.select({ id: campaigns.id }).from(campaigns).where(eq(campaigns.slug, 'tern-1'));
    if (!c) return;
    await db.insert(budgetLines).values(lines.map((l, position) => ({ ...l, position, campaignId: c.id })));
  },
};
