import { Router } from 'express';
import { sql } from 'drizzle-orm';
import type { Db } from '../../db/client';

export function createHealthRouter({ db }: { db: Db }) {
  const router = Router();
  router.get('/', async (_req, res) => {
    try {
      await Promise.race([
        db.execute(sql`select 1`),
        new Promise((_, reject) => setTimeout(() => reject(new Error('database timeout')), 2000)),
      ]);
      res.json({ status: 'ok', db: 'ok' });
    } catch {
      res.status(503).json({ status: 'degraded', db: 'unreachable' });
    }
  });
  return router;
}
