import type { AccountView } from '../shared/schemas/auth';

declare global {
  namespace Express {
    // The signed-in account as passport puts it on req.user.
    interface User extends AccountView {}
  }
}

declare module 'express-session' {
  interface SessionData {
    returnTo?: string;
    csrfToken?: string;
  }
}

export {};
