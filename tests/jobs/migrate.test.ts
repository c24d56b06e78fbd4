// Processes that migrate one empty database at the same moment (several app instances deployed together) must not
// apply a migration twice or fail half-way: one migrates, the others find the work done.
import { inject, describe, expect, it } from 'vitest';
import { randomBytes } from 'node:crypto';
import { readFileSync } from 'node:fs';
import path from 'node:path';
import pg from 'pg';
import { migrateDatabase, migrationsFolder } from '../../server/db/migrate';

describe('migrations', () => {
  it('three processes migrating one empty database at once apply every migration exactly once', async () => {
    const adminUrl = inject('pgAdminUrl');
    const name = `m_${randomBytes(4).toString('hex')}`;
    const admin = new pg.Client({ connectionString: adminUrl });
    await admin.connect();
    await admin.query(`create database "${name}"`);
    const url = adminUrl.replace(/\/[^/]*$/, `/${name}`);
    try {
      await Promise.all([migrateDatabase(url), migrateDatabase(url), migrateDatabase(url)]);
      const journal = JSON.parse(readFileSync(path.join(migrationsFolder, 'meta', '_journal.json'), 'utf8')) as { entries: unknown[] };
      const c = new pg.Client({ connectionString: url });
      await c.connect();
      try {
        const { rows } = await c.query<{ n: number }>('select count(*)::int as n from drizzle.__drizzle_migrations');
        expect(rows[0]!.n).toBe(journal.entries.length);
        const { rows: queueTable } = await c.query(
          "select 1 from information_schema.tables where table_schema = 'pgboss' and table_name = 'queue'",
        );
        expect(queueTable).toHaveLength(1);
      } finally {
        await c.end();
      }
    } finally {
      await admin.query(`drop database if exists "${name}" with (force)`);
      await admin.end();
    }
  }, 120_000);
});
