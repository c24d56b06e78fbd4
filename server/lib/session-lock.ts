import pg from 'pg';

/**
 * Runs `fn` while this process holds a PostgreSQL session advisory lock named `key`: other processes asking for the
 * same key wait their turn. The lock lives on a connection of its own (`fn` may use any other), and ending that
 * connection lets go of it too, should the unlock itself fail.
 */
export async function withSessionLock<T>(connection: string | pg.ClientConfig, key: string, fn: () => Promise<T>): Promise<T> {
  const lock = new pg.Client(typeof connection === 'string' ? { connectionString: connection } : connection);
  await lock.connect();
  try {
    await lock.query('select pg_advisory_lock(hashtext($1))', [key]);
    return await fn();
  } finally {
    await lock.query('select pg_advisory_unlock(hashtext($1))', [key]).catch(() => undefined);
    await lock.end().catch(() => undefined);
  }
}
