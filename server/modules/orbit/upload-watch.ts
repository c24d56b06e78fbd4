import type pg from 'pg';
import type { Logger } from 'pino';
import { createPgListener, type PgListener } from '../../lib/pg-listen';

/** The channel a trigger on orbit_ingest_jobs NOTIFYs with the upload's id on every change (migration 0021). */
export const UPLOAD_CHANGED_CHANNEL = 'orbit_upload_changed';

/** While the listener is down, a held request answers after this long instead (the client then asks again). */
const UNWATCHED_WAIT_MS = 1000;

export type UploadWatch = ReturnType<typeof createUploadWatch>;

/**
 * Lets a request wait for an upload to change (its status page asks "answer when this is no longer what I have"):
 * one LISTEN connection per process, opened on first use, fanned out to the waiting requests by upload id. Works
 * with any number of web processes and workers, since the change is announced by the database.
 */
export function createUploadWatch(pool: pg.Pool, log: Pick<Logger, 'warn'>) {
  const waiting = new Map<string, Set<() => void>>();
  let listener: PgListener | null = null;
  let started: Promise<void> | null = null;
  const wakeAll = () => {
    for (const set of waiting.values()) for (const wake of set) wake();
  };

  function ensureListening() {
    if (!started) {
      listener = createPgListener({
        pool,
        channel: UPLOAD_CHANGED_CHANNEL,
        log,
        what: 'upload change listener (held status requests answer after 1 s meanwhile)',
        onMessage: (id) => {
          for (const wake of waiting.get(id) ?? []) wake();
        },
        // Changes may be missed until it is back: the held requests answer now, with what the database holds.
        onLost: wakeAll,
      });
      started = listener.start();
    }
    return started;
  }

  return {
    /**
     * Starts watching `id` before the caller reads the row, so a change committed in between is not missed.
     * `changed` resolves on the upload's next change, after `ms`, or when `signal` aborts; `done()` lets go.
     */
    async watch(id: string, ms: number, signal?: AbortSignal) {
      await ensureListening();
      let wake!: () => void;
      const changed = new Promise<void>((resolve) => (wake = resolve));
      const set = waiting.get(id) ?? new Set();
      set.add(wake);
      waiting.set(id, set);
      const timer = setTimeout(wake, listener?.listening() ? ms : Math.min(ms, UNWATCHED_WAIT_MS));
      signal?.addEventListener('abort', wake, { once: true });
      return {
        changed,
        done() {
          clearTimeout(timer);
          signal?.removeEventListener('abort', wake);
          set.delete(wake);
          if (set.size === 0 && waiting.get(id) === set) waiting.delete(id);
        },
      };
    },
    async stop() {
      wakeAll();
      await listener?.stop();
      listener = null;
      started = null;
    },
  };
}
