import { fileURLToPath } from 'node:url';
import pg from 'pg';
import PgBoss from 'pg-boss';
import { drizzle } from 'drizzle-orm/node-postgres';
import { migrate } from 'drizzle-orm/node-postgres/migrator';
import { withSessionLock } from '../lib/session-lock';

export const migrationsFolder = fileURLToPath(new URL('../../drizzle', import.meta.url));

/** The advisory lock under which one process at a time migrates a database. */
const MIGRATION_LOCK = 'lightkeel:migrations';

/**
 * Applies the migrations and installs pg-boss's tables. Processes migrating one database at the same moment (several
 * instances deployed together) take turns under an advisory lock: the first migrates, the others find nothing left.
 */
export async function migrateDatabase(url: string) {
  await withSessionLock(url, MIGRATION_LOCK, () => migrateLocked(url));
}

async function migrateLocked(url: string) {
  const pool = new pg.Pool({ connectionString: url, max: 1 });
  try {
    await migrate(drizzle(pool), { migrationsFolder });
    // The job system's own tables (schema "pgboss"), created or upgraded by pg-boss itself (it takes an
    // advisory lock, so concurrent starts are safe). Installing them here keeps every process's start cheap.
    const boss = new PgBoss({
      db: { executeSql: (text, values) => pool.query(text, values) },
      schema: 'pgboss',
      supervise: false,
      schedule: false,
    });
    await boss.start();
    await boss.stop({ graceful: false, close: false });
  } finally {
    await pool.end();
  }
}
