import type { SessionData, Store } from 'express-session';

/** How often an unchanged session's expiry is written back at most. */
export const SESSION_TOUCH_EVERY_MS = 5 * 60_000;
const REMEMBERED = 10_000;

/**
 * express-session "touches" an unchanged session on every request (with `rolling`, to move its expiry on): one
 * durable UPDATE per signed-in request, polls included. Against a 30-day lifetime, moving the stored expiry on at
 * most every few minutes per session loses nothing, so touches in between are answered at once without a write.
 * The cookie itself is still renewed on every response; saves of changed sessions are not affected.
 */
export function throttleTouch<S extends Store>(store: S, everyMs = SESSION_TOUCH_EVERY_MS): S {
  // The typings say the callback takes no argument; the stores pass their error (connect-pg-simple does).
  const touch = store.touch?.bind(store) as ((sid: string, session: SessionData, cb: (err?: unknown) => void) => void) | undefined;
  if (!touch) return store;
  const last = new Map<string, number>();
  store.touch = (sid, session, callback) => {
    const now = Date.now();
    const at = last.get(sid);
    if (at !== undefined && now - at < everyMs) return callback?.();
    if (last.size >= REMEMBERED) last.clear();
    touch(sid, session, (err?: unknown) => {
      if (!err) last.set(sid, now);
      (callback as ((err?: unknown) => void) | undefined)?.(err);
    });
  };
  // A session destroyed or saved anew starts its own count.
  const destroy = store.destroy.bind(store);
  store.destroy = (sid, callback) => {
    last.delete(sid);
    destroy(sid, callback);
  };
  return store;
}
