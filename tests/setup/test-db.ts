import { inject } from 'vitest';
import { randomBytes } from 'node:crypto';
import pg from 'pg';
import { createDb, type Db } from '../../server/db/client';

export type TestDatabase = { url: string; db: Db; pool: pg.Pool; drop: () => Promise<void> };

// A fresh database cloned from the migrated template: each test file gets its own data.
export async function createTestDatabase(): Promise<TestDatabase> {
  const adminUrl = inject('pgAdminUrl');
  const template = inject('pgTemplate');
  const name = `t_${process.env.VITEST_POOL_ID ?? '0'}_${randomBytes(4).toString('hex')}`;
  const admin = new pg.Client({ connectionString: adminUrl });
  await admin.connect();
  try {
    await admin.query(`create database "${name}" template "${template}"`);
  } finally {
    await admin.end();
  }
  const url = adminUrl.replace(/\/[^/]*$/, `/${name}`);
  const { db, pool } = createDb(url);
  return {
    url,
    db,
    pool,
    drop: async () => {
      await pool.end();
      const c = new pg.Client({ connectionString: adminUrl });
      await c.connect();
      try {
        await c.query(`drop database if exists "${name}" with (force)`);
      } finally {
        await c.end();
      }
    },
  };
}
