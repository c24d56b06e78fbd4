import { sql } from 'drizzle-orm';
import type { Db } from '../db/client';
import type { Config } from '../config';
import { accounts } from '../modules/accounts/accounts.tables';
import { seedDemoAccounts } from './accounts';
import { orbitSeeder } from './orbit-seed';
import { campaignSeeder } from './campaign-seed';
import { flightBudgetSeeder } from './flight-budget-seed';
import { dispatchSeeder } from './dispatch-seed';

export type SeedContext = { db: Db; config: Config; log: (message: string) => void; accountIds: Record<string, string> };
export type Seeder = {
  name: string;
  run: (ctx: SeedContext) => Promise<void>;
  /** True when this seeder's data is already there; a kept database then gets only what it lacks. */
  isSeeded: (db: Db) => Promise<boolean>;
};

// Each feature adds its own seeder here; they run in order, each only where its data is missing.
export const seeders: Seeder[] = [orbitSeeder, campaignSeeder, flightBudgetSeeder, dispatchSeeder];

export async function isDatabaseEmpty(db: Db) {
  const [row] = await db.select({ n: sql<number>`count(*)::int` }).from(accounts);
  return (row?.n ?? 0) === 0;
}

export async function seedDemo({ db, config, log }: { db: Db; config: Config; log: (m: string) => void }) {
  const fresh = await isDatabaseEmpty(db);
  if (fresh) log('seeding the demo scenario: the Saltmarsh Orbital Society and Tern-1');
  const accountIds = await seedDemoAccounts(db);
  for (const s of seeders) {
    if (await s.isSeeded(db)) continue;
    log(`seeding ${s.name} …`);
    await s.run({ db, config, log, accountIds });
  }
}
