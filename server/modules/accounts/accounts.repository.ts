import { and, eq, ilike, or, sql, asc, isNull } from 'drizzle-orm';
import type { Db } from '../../db/client';
import { accounts, accountRoles, identities } from './accounts.tables';
import type { AccountView, Role } from '../../../shared/schemas/auth';
import { conflict } from '../../errors';

export type AccountRow = typeof accounts.$inferSelect;

function isUniqueViolation(err: unknown) {
  const e = err as { code?: string; cause?: { code?: string } };
  return e?.code === '23505' || e?.cause?.code === '23505';
}

export function createAccountsRepository({ db }: { db: Db }) {
  async function rolesOf(accountId: string, tx: Db = db): Promise<Role[]> {
    const rows = await tx.select({ role: accountRoles.role }).from(accountRoles).where(eq(accountRoles.accountId, accountId));
    return rows.map((r) => r.role).sort();
  }

  async function view(row: AccountRow, tx: Db = db): Promise<AccountView> {
    return {
      id: row.id,
      email: row.email,
      displayName: row.displayName,
      roles: await rolesOf(row.id, tx),
      emailVerified: row.emailVerifiedAt !== null,
      createdAt: row.createdAt.toISOString(),
    };
  }

  return {
    rolesOf,
    view,
    async findById(id: string, tx: Db = db) {
      const [row] = await tx
        .select()
        .from(accounts)
        .where(and(eq(accounts.id, id), isNull(accounts.deletedAt)));
      return row;
    },
    async findByEmail(email: string, tx: Db = db) {
      const [row] = await tx
        .select()
        .from(accounts)
        .where(and(sql`lower(${accounts.email}) = lower(${email})`, isNull(accounts.deletedAt)));
      return row;
    },
    async findIdentity(provider: string, subject: string, tx: Db = db) {
      const [row] = await tx
        .select()
        .from(identities)
        .where(and(eq(identities.provider, provider), eq(identities.subject, subject)));
      return row;
    },
    async passwordIdentity(accountId: string, tx: Db = db) {
      const [row] = await tx
        .select()
        .from(identities)
        .where(and(eq(identities.accountId, accountId), eq(identities.provider, 'password')));
      return row;
    },
    /** Creates an account with the backer role; a taken e-mail (any case) is a domain error. */
    async create(tx: Db, input: { email: string; displayName: string; emailVerified?: boolean; roles?: Role[] }): Promise<AccountRow> {
      try {
        const [row] = await tx
          .insert(accounts)
          .values({ email: input.email, displayName: input.displayName, emailVerifiedAt: input.emailVerified ? new Date() : null })
          .returning();
        const roles = new Set<Role>(['backer', ...(input.roles ?? [])]);
        await tx.insert(accountRoles).values([...roles].map((role) => ({ accountId: row!.id, role })));
        return row!;
      } catch (err) {
        if (isUniqueViolation(err)) throw conflict('auth.email_taken', 'An account with this e-mail already exists. Sign in instead.');
        throw err;
      }
    },
    async list(q?: string) {
      const where = q ? or(ilike(accounts.email, `%${q}%`), ilike(accounts.displayName, `%${q}%`)) : undefined;
      const rows = await db
        .select()
        .from(accounts)
        .where(and(isNull(accounts.deletedAt), where))
        .orderBy(asc(accounts.createdAt))
        .limit(500);
      return Promise.all(rows.map((r) => view(r)));
    },
  };
}

export type AccountsRepository = ReturnType<typeof createAccountsRepository>;
