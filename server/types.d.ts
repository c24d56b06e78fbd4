import type { AccountView } from '../shared/schemas/auth';

declare global {
  namespace Express {
    // The signed-in account as passport puts it on req.user.
    // eslint-disable-next-line @typescript-eslint/no-empty-object-type -- declaration merging needs the interface form
    interface User extends AccountView {}
  }
}

declare module 'express-session' {
  interface SessionData {
    returnTo?: string;
    /** Google sign-ins this browser started: OAuth state handle and PKCE verifier (see oauth-state-store.ts). */
    oauthFlows?: { handle: string; verifier: string; startedAt: number }[];
    csrfToken?: string;
  }
}

export {};
