import pg from 'pg';
import { drizzle, type NodePgDatabase } from 'drizzle-orm/node-postgres';
import * as schema from './schema';

export type Db = NodePgDatabase<typeof schema>;

export const DEFAULT_CONNECT_TIMEOUT_MS = 5_000;
export const DEFAULT_STATEMENT_TIMEOUT_MS = 15_000;

export function createDb(url: string, opts: { max?: number; connectTimeoutMs?: number; statementTimeoutMs?: number } = {}) {
  const pool = new pg.Pool({
    connectionString: url,
    max: opts.max ?? 10,
    // Without these a request waits for ever on a database that does not answer, or on a locked table.
    connectionTimeoutMillis: opts.connectTimeoutMs ?? DEFAULT_CONNECT_TIMEOUT_MS,
    statement_timeout: opts.statementTimeoutMs ?? DEFAULT_STATEMENT_TIMEOUT_MS,
  });
  // An idle client whose server connection ends (restart, failover, a dropped test database) emits
  // 'error' on the pool; unhandled, that would crash the process. The pool replaces the client.
  pool.on('error', (err) => {
    if ((err as { code?: string }).code !== '57P01') process.stderr.write(`[db] idle client error: ${err.message}\n`);
  });
  const db = drizzle(pool, { schema });
  return { db, pool };
}
