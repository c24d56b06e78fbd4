import { and, eq } from 'drizzle-orm';
import type { Db } from '../../db/client';
import { accountRoles } from './accounts.tables';
import { createAccountsRepository } from './accounts.repository';
import { recordAudit } from '../audit/audit.repository';
import { conflict, notFound } from '../../errors';
import type { Role } from '../../../shared/schemas/auth';

export function createAdminService({ db }: { db: Db }) {
  const repo = createAccountsRepository({ db });
  return {
    async grantRole({ actorId, accountId, role }: { actorId: string; accountId: string; role: Role }) {
      return db.transaction(async (tx) => {
        const account = await repo.findById(accountId, tx);
        if (!account) throw notFound('admin.account_not_found', 'No such account.');
        const before = await repo.rolesOf(accountId, tx);
        if (!before.includes(role)) {
          await tx.insert(accountRoles).values({ accountId, role }).onConflictDoNothing();
          await recordAudit(tx, {
            actorId,
            action: 'role.granted',
            subjectType: 'account',
            subjectId: accountId,
            before: { roles: before },
            after: { roles: [...before, role].sort() },
          });
        }
        return repo.view(account, tx);
      });
    },
    async revokeRole({ actorId, accountId, role }: { actorId: string; accountId: string; role: Role }) {
      return db.transaction(async (tx) => {
        const account = await repo.findById(accountId, tx);
        if (!account) throw notFound('admin.account_not_found', 'No such account.');
        if (role === 'admin') {
          // Lock every admin row so two concurrent revocations cannot both pass the count.
          const admins = await tx.select().from(accountRoles).where(eq(accountRoles.role, 'admin')).for('update');
          if (admins.length <= 1 && admins.some((a) => a.accountId === accountId)) {
            throw conflict('admin.last_admin', 'This is the last admin account; grant admin to someone else first.');
          }
        }
        const before = await repo.rolesOf(accountId, tx);
        if (before.includes(role)) {
          await tx.delete(accountRoles).where(and(eq(accountRoles.accountId, accountId), eq(accountRoles.role, role)));
          await recordAudit(tx, {
            actorId,
            action: 'role.revoked',
            subjectType: 'account',
            subjectId: accountId,
            before: { roles: before },
            after: { roles: before.filter((r) => r !== role) },
          });
        }
        return repo.view(account, tx);
      });
    },
  };
}
