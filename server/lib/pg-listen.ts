import pg from 'pg';
import type { Logger } from 'pino';

export type PgListener = {
  /** Connects and LISTENs; a failure is logged and retried, never thrown. */
  start(): Promise<void>;
  stop(): Promise<void>;
  /** Whether the LISTEN connection is up now (a NOTIFY sent while it is down is not seen). */
  listening(): boolean;
};

/**
 * LISTENs on one channel on a connection of its own (outside the pool, so no pooled client is held for good),
 * reconnecting 5 s after a drop. PostgreSQL delivers a NOTIFY when its transaction commits, so a message means the
 * change it announces is visible. `onLost` runs when the connection drops: messages may be missed until it is back.
 */
export function createPgListener(opts: {
  pool: pg.Pool;
  channel: string;
  log: Pick<Logger, 'warn'>;
  /** What the listener is for, in the log lines ("job wake-up listener"). */
  what: string;
  onMessage: (payload: string) => void;
  onLost?: () => void;
}): PgListener {
  const { pool, channel, log, what } = opts;
  let client: pg.Client | null = null;
  let stopping = false;
  let retry: ReturnType<typeof setTimeout> | undefined;
  async function connect() {
    const c = new pg.Client(pool.options);
    c.on('notification', (m) => {
      if (m.channel === channel && m.payload) opts.onMessage(m.payload);
    });
    c.on('error', (err) => {
      log.warn({ err }, `${what} lost its connection; retrying in 5 s`);
      void c.end().catch(() => undefined);
      if (client === c) client = null;
      opts.onLost?.();
      // unref: a retry alone never keeps a process alive (one left running when its database went away).
      if (!stopping) retry = setTimeout(() => void connect().catch(() => undefined), 5000).unref();
    });
    await c.connect();
    await c.query(`listen ${pg.escapeIdentifier(channel)}`);
    client = c;
  }
  return {
    start: () => connect().catch((err: unknown) => log.warn({ err }, `${what} did not start`)),
    async stop() {
      stopping = true;
      clearTimeout(retry);
      await client?.end().catch(() => undefined);
      client = null;
      opts.onLost?.();
    },
    listening: () => client !== null,
  };
}
