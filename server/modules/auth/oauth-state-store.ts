import { randomBytes } from 'node:crypto';
import type { Request } from 'express';

type PendingFlow = { handle: string; verifier: string; startedAt: number };
type Info = { code: string; message: string };

// A browser may have a few sign-ins under way (two tabs); each one's state is good for one callback.
const MAX_PENDING = 5;
const FLOW_TTL_MS = 10 * 60_000;

export const stateMismatch: Info = {
  code: 'auth.state_mismatch',
  message: 'This Google sign-in did not start in this browser, so nobody was signed in.',
};

/**
 * passport-oauth2's state store for `pkce: true`: keeps each flow's state handle and PKCE code verifier in the
 * session of the browser that started it, so a callback carrying a code from another browser's flow finds
 * no matching state and is refused (login CSRF), and the code cannot be exchanged without this verifier.
 */
export class SessionOAuthStateStore {
  store(req: Request, verifier: string, _state: unknown, _meta: unknown, done: (err: Error | null, handle?: string) => void) {
    if (!req.session) return done(new Error('OAuth state needs a session'));
    const handle = randomBytes(24).toString('base64url');
    const now = Date.now();
    const pending = (req.session.oauthFlows ?? []).filter((f) => now - f.startedAt < FLOW_TTL_MS);
    req.session.oauthFlows = [...pending, { handle, verifier, startedAt: now } satisfies PendingFlow].slice(-MAX_PENDING);
    done(null, handle);
  }

  verify(req: Request, providedState: unknown, done: (err: Error | null, verifier: string | false, info?: Info) => void) {
    const pending = req.session?.oauthFlows ?? [];
    const flow =
      typeof providedState === 'string'
        ? pending.find((f) => f.handle === providedState && Date.now() - f.startedAt < FLOW_TTL_MS)
        : undefined;
    if (req.session) {
      // A callback spends its flow whatever the outcome; a refused callback also spends the flows it could not match.
      const rest = flow ? pending.filter((f) => f !== flow) : [];
      if (rest.length) req.session.oauthFlows = rest;
      else delete req.session.oauthFlows;
    }
    if (!flow) return done(null, false, stateMismatch);
    done(null, flow.verifier);
  }
}
