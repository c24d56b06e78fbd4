import { Router } from 'express';
import { z } from 'zod';
import type { Db } from '../../db/client';
import { validated } from '../../middleware/validate';
import { requireRole } from '../../middleware/auth';
import { listLedger } from './ledger.repository';

export function createLedgerRouter({ db }: { db: Db }) {
  const router = Router();
  router.get(
    '/',
    requireRole('finance', 'admin'),
    validated(
      { query: z.object({ limit: z.coerce.number().int().min(1).max(1000).default(200), campaignId: z.uuid().optional() }) },
      async (_req, res, { query }) => {
        res.json({ entries: await listLedger(db, query) });
      },
    ),
  );
  return router;
}
