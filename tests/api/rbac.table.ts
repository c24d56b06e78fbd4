// The RBAC matrix: every API route the app serves, and what each kind of caller gets.
// A number is the exact status; 'ok' means allowed (any status but 401/403: a 400 for an empty body
// still proves the guard let the caller in). The test fails when the app has a route missing here.
export type Caller = 'anon' | 'backer' | 'outreach' | 'engineer' | 'finance' | 'admin';
export type Expect = number | 'ok';
export type Row = { route: string; sample?: string; body?: unknown } & Record<Caller, Expect>;

const everyone = { anon: 'ok', backer: 'ok', outreach: 'ok', engineer: 'ok', finance: 'ok', admin: 'ok' } as const;
const signedIn = { anon: 401, backer: 'ok', outreach: 'ok', engineer: 'ok', finance: 'ok', admin: 'ok' } as const;
const adminOnly = { anon: 401, backer: 403, outreach: 403, engineer: 403, finance: 403, admin: 'ok' } as const;
export const engineerWrite = { anon: 401, backer: 403, outreach: 403, engineer: 'ok', finance: 403, admin: 'ok' } as const;
export const staffRead = { anon: 401, backer: 403, outreach: 'ok', engineer: 'ok', finance: 403, admin: 'ok' } as const;
export const outreachWrite = { anon: 401, backer: 403, outreach: 'ok', engineer: 403, finance: 403, admin: 'ok' } as const;
export const financeOnly = { anon: 401, backer: 403, outreach: 403, engineer: 403, finance: 'ok', admin: 'ok' } as const;
export { everyone, signedIn, adminOnly };

const someId = '00000000-0000-4000-8000-000000000000';

export const rbacTable: Row[] = [
  { route: 'GET /api/health', ...everyone, anon: 200 },
  { route: 'GET /api/auth/csrf', ...everyone },
  { route: 'GET /api/auth/providers', ...everyone },
  { route: 'GET /api/auth/me', ...signedIn, backer: 200, admin: 200 },
  { route: 'POST /api/auth/sign-up', ...everyone },
  { route: 'POST /api/auth/sign-in', ...everyone },
  // Signing out as a role would end the shared test session: it is exercised in auth.test.ts.
  { route: 'POST /api/auth/sign-out', ...everyone, skipSignedIn: true } as Row,
  { route: 'GET /api/auth/google', ...everyone, anon: 302 },
  { route: 'GET /api/auth/google/callback', ...everyone, anon: 302 },
  { route: 'POST /api/auth/verify-email', ...everyone, anon: 400 },
  { route: 'POST /api/auth/resend-verification', ...signedIn },
  { route: 'POST /api/auth/request-password-reset', ...everyone, anon: 400 },
  { route: 'POST /api/auth/reset-password', ...everyone, anon: 400 },
  { route: 'PATCH /api/account', ...signedIn, backer: 400 },
  { route: 'GET /api/admin/accounts', ...adminOnly, admin: 200 },
  { route: 'POST /api/admin/accounts/:id/roles', sample: `/api/admin/accounts/${someId}/roles`, ...adminOnly, admin: 400 },
  { route: 'DELETE /api/admin/accounts/:id/roles/:role', sample: `/api/admin/accounts/${someId}/roles/finance`, ...adminOnly, admin: 404 },
  { route: 'GET /api/admin/audit', ...adminOnly, admin: 200 },
];
