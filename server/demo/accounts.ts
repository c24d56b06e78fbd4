import { hash, type Algorithm } from '@node-rs/argon2';
import type { Db } from '../db/client';
import { identities } from '../modules/accounts/accounts.tables';
import { createAccountsRepository } from '../modules/accounts/accounts.repository';
import type { Role } from '../../shared/schemas/auth';

// The fictional Saltmarsh Orbital Society's team: one demo account per role.
export const DEMO_PASSWORD = 'tern-1-demo-pass';
export const demoAccounts: { email: string; displayName: string; roles: Role[] }[] = [
  { email: 'admin@saltmarsh.example', displayName: 'Ada Marram (admin)', roles: ['admin'] },
  { email: 'engineer@saltmarsh.example', displayName: 'Ravi Samphire (engineer)', roles: ['engineer'] },
  { email: 'outreach@saltmarsh.example', displayName: 'Jo Glasswort (outreach)', roles: ['outreach'] },
  { email: 'finance@saltmarsh.example', displayName: 'Mina Sealavender (finance)', roles: ['finance'] },
  { email: 'backer@saltmarsh.example', displayName: 'Wren Dunlin', roles: [] },
];

export async function seedDemoAccounts(db: Db) {
  const repo = createAccountsRepository({ db });
  const passwordHash = await hash(DEMO_PASSWORD, { algorithm: 2 as Algorithm });
  const ids: Record<string, string> = {};
  for (const a of demoAccounts) {
    const existing = await repo.findByEmail(a.email);
    if (existing) {
      ids[a.email] = existing.id;
      continue;
    }
    await db.transaction(async (tx) => {
      const row = await repo.create(tx, { email: a.email, displayName: a.displayName, emailVerified: true, roles: a.roles });
      await tx.insert(identities).values({ accountId: row.id, provider: 'password', passwordHash });
      ids[a.email] = row.id;
    });
  }
  return ids;
}
