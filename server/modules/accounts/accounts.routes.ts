import { Router } from 'express';
import { z } from 'zod';
import { eq } from 'drizzle-orm';
import type { Db } from '../../db/client';
import { validated } from '../../middleware/validate';
import { requireAuth, requireRole } from '../../middleware/auth';
import { accounts } from './accounts.tables';
import { createAccountsRepository } from './accounts.repository';
import { createAdminService } from './admin.service';
import { listAudit, recordAudit } from '../audit/audit.repository';
import { accountSearchQuerySchema, grantRoleSchema, roleSchema, updateAccountSchema } from '../../../shared/schemas/auth';

export function createAccountRouter({ db }: { db: Db }) {
  const router = Router();
  const repo = createAccountsRepository({ db });
  router.patch(
    '/',
    requireAuth,
    validated({ body: updateAccountSchema }, async (req, res, { body }) => {
      const id = req.user!.id;
      const row = await db.transaction(async (tx) => {
        const [updated] = await tx.update(accounts).set({ displayName: body.displayName }).where(eq(accounts.id, id)).returning();
        await recordAudit(tx, {
          actorId: id,
          action: 'account.renamed',
          subjectType: 'account',
          subjectId: id,
          before: { displayName: req.user!.displayName },
          after: { displayName: body.displayName },
        });
        return updated!;
      });
      res.json({ account: await repo.view(row) });
    }),
  );
  return router;
}

export function createAdminRouter({ db }: { db: Db }) {
  const router = Router();
  const repo = createAccountsRepository({ db });
  const admin = createAdminService({ db });
  router.use(requireRole('admin'));
  router.get(
    '/accounts',
    validated({ query: accountSearchQuerySchema }, async (_req, res, { query }) => {
      res.json({ accounts: await repo.list(query.q) });
    }),
  );
  const idParams = z.object({ id: z.uuid({ message: 'must be an account id' }) });
  router.post(
    '/accounts/:id/roles',
    validated({ params: idParams, body: grantRoleSchema }, async (req, res, { params, body }) => {
      res.json({ account: await admin.grantRole({ actorId: req.user!.id, accountId: params.id, role: body.role }) });
    }),
  );
  router.delete(
    '/accounts/:id/roles/:role',
    validated({ params: idParams.extend({ role: roleSchema }) }, async (req, res, { params }) => {
      res.json({ account: await admin.revokeRole({ actorId: req.user!.id, accountId: params.id, role: params.role }) });
    }),
  );
  router.get(
    '/audit',
    validated({ query: z.object({ limit: z.coerce.number().int().min(1).max(500).default(100) }) }, async (_req, res, { query }) => {
      res.json({ entries: await listAudit(db, query.limit) });
    }),
  );
  return router;
}
