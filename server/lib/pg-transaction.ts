import { drizzle } from 'drizzle-orm/node-postgres';
import type pg from 'pg';
import type { Db } from '../db/client';
import * as schema from '../db/schema';

/** Runs SQL for pg-boss on the same connection, so a job is enqueued in the transaction that causes it. */
export type SqlExecutor = { executeSql: (text: string, values?: unknown[]) => Promise<{ rows: unknown[] }> };

/**
 * One transaction on one pooled connection, handed out both as a Drizzle database and as an executor for
 * pg-boss's `send(…, { db })`: the row change and the job commit or roll back together.
 */
export async function withTransaction<T>(pool: pg.Pool, fn: (tx: Db, executor: SqlExecutor) => Promise<T>): Promise<T> {
  const client = await pool.connect();
  try {
    await client.query('begin');
    const tx = drizzle(client, { schema }) as unknown as Db;
    const executor: SqlExecutor = { executeSql: (text, values) => client.query(text, values as unknown[]) };
    const out = await fn(tx, executor);
    await client.query('commit');
    return out;
  } catch (err) {
    await client.query('rollback').catch(() => undefined);
    throw err;
  } finally {
    client.release();
  }
}
