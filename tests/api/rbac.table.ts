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
  // Pledges and memberships (issue 5). No campaign exists in the RBAC database, hence the 404s.
  { route: 'POST /api/payments/webhook', anon: 400, backer: 400, outreach: 400, engineer: 400, finance: 400, admin: 400 },
  { route: 'GET /api/campaigns', ...everyone, anon: 200, backer: 200 },
  { route: 'GET /api/campaigns/:slug', sample: '/api/campaigns/tern-1', anon: 404, backer: 404, outreach: 404, engineer: 404, finance: 404, admin: 404 },
  { route: 'GET /api/campaigns/:slug/backers', sample: '/api/campaigns/tern-1/backers', anon: 404, backer: 404, outreach: 404, engineer: 404, finance: 404, admin: 404 },
  { route: 'GET /api/campaigns/:slug/manage', sample: '/api/campaigns/tern-1/manage', ...outreachWrite, outreach: 404, admin: 404 },
  { route: 'PATCH /api/campaigns/:slug', sample: '/api/campaigns/tern-1', ...outreachWrite, outreach: 400, admin: 400 },
  { route: 'POST /api/campaigns/:slug/tiers', sample: '/api/campaigns/tern-1/tiers', ...outreachWrite, outreach: 400, admin: 400 },
  { route: 'PATCH /api/campaigns/:slug/tiers/:tierId', sample: `/api/campaigns/tern-1/tiers/${someId}`, ...outreachWrite, outreach: 400, admin: 400 },
  { route: 'PUT /api/campaigns/:slug/stretch-targets', sample: '/api/campaigns/tern-1/stretch-targets', ...outreachWrite, outreach: 400, admin: 400 },
  { route: 'POST /api/pledges', ...signedIn, backer: 400, admin: 400 },
  { route: 'GET /api/pledges/:id', sample: `/api/pledges/${someId}`, ...signedIn, backer: 404, admin: 404 },
  { route: 'POST /api/pledges/:id/cancel', sample: `/api/pledges/${someId}/cancel`, ...signedIn, backer: 404, admin: 404 },
  { route: 'GET /api/my-support/pledges', ...signedIn, backer: 200, finance: 200 },
  { route: 'GET /api/my-support/memberships', ...signedIn, backer: 200 },
  { route: 'POST /api/my-support/memberships/:id/cancel', sample: `/api/my-support/memberships/${someId}/cancel`, ...signedIn, backer: 404 },
  { route: 'POST /api/my-support/memberships/:id/resume', sample: `/api/my-support/memberships/${someId}/resume`, ...signedIn, backer: 404 },
  { route: 'POST /api/my-support/memberships/:id/card', sample: `/api/my-support/memberships/${someId}/card`, ...signedIn, backer: 404 },
  { route: 'GET /api/my-support/receipts/:entryId', sample: '/api/my-support/receipts/1', ...signedIn, backer: 404 },
  { route: 'GET /api/my-support/email-preferences', ...signedIn, backer: 200 },
  { route: 'PUT /api/my-support/email-preferences', ...signedIn, backer: 400 },
  { route: 'GET /api/my-support/export', ...signedIn, backer: 200 },
  // An empty body never deletes: the e-mail confirmation is required.
  { route: 'DELETE /api/my-support/account', ...signedIn, backer: 400, admin: 400 },
  { route: 'GET /api/ledger', ...financeOnly, finance: 200 },
  // Orbit desk (issue 4). No spacecraft exists in the RBAC database, hence the 404s.
  { route: 'GET /api/orbit/spacecraft', ...staffRead, engineer: 200, outreach: 200 },
  { route: 'POST /api/orbit/spacecraft', ...engineerWrite, engineer: 400, admin: 400 },
  { route: 'GET /api/orbit/spacecraft/:id', sample: `/api/orbit/spacecraft/${someId}`, ...staffRead, outreach: 404, engineer: 404, admin: 404 },
  { route: 'PUT /api/orbit/spacecraft/:id', sample: `/api/orbit/spacecraft/${someId}`, ...engineerWrite, engineer: 400, admin: 400 },
  { route: 'POST /api/orbit/spacecraft/:id/uploads', sample: `/api/orbit/spacecraft/${someId}/uploads`, ...engineerWrite, engineer: 400, admin: 400 },
  { route: 'GET /api/orbit/uploads/:jobId', sample: `/api/orbit/uploads/${someId}`, ...engineerWrite, engineer: 404, admin: 404 },
  { route: 'POST /api/orbit/uploads/:jobId/import', sample: `/api/orbit/uploads/${someId}/import`, ...engineerWrite, engineer: 404, admin: 404 },
  { route: 'POST /api/orbit/uploads/:jobId/cancel', sample: `/api/orbit/uploads/${someId}/cancel`, ...engineerWrite, engineer: 404, admin: 404 },
  { route: 'GET /api/orbit/spacecraft/:id/files', sample: `/api/orbit/spacecraft/${someId}/files`, ...engineerWrite, engineer: 404, admin: 404 },
  { route: 'GET /api/orbit/files/:fileId/original', sample: `/api/orbit/files/${someId}/original`, ...engineerWrite, engineer: 404, admin: 404 },
  { route: 'GET /api/orbit/spacecraft/:id/element-sets', sample: `/api/orbit/spacecraft/${someId}/element-sets`, ...engineerWrite, engineer: 404, admin: 404 },
  { route: 'GET /api/orbit/spacecraft/:id/element-sets.csv', sample: `/api/orbit/spacecraft/${someId}/element-sets.csv`, ...engineerWrite, engineer: 404, admin: 404 },
  { route: 'GET /api/orbit/spacecraft/:id/trend', sample: `/api/orbit/spacecraft/${someId}/trend`, ...engineerWrite, engineer: 404, admin: 404 },
  { route: 'GET /api/orbit/spacecraft/:id/sail-yield', sample: `/api/orbit/spacecraft/${someId}/sail-yield`, ...engineerWrite, engineer: 404, admin: 404 },
  { route: 'GET /api/orbit/spacecraft/:id/sailing-periods', sample: `/api/orbit/spacecraft/${someId}/sailing-periods`, ...engineerWrite, engineer: 404, admin: 404 },
  { route: 'POST /api/orbit/spacecraft/:id/sailing-periods', sample: `/api/orbit/spacecraft/${someId}/sailing-periods`, ...engineerWrite, engineer: 400, admin: 400 },
  { route: 'PUT /api/orbit/sailing-periods/:periodId', sample: `/api/orbit/sailing-periods/${someId}`, ...engineerWrite, engineer: 400, admin: 400 },
  { route: 'DELETE /api/orbit/sailing-periods/:periodId', sample: `/api/orbit/sailing-periods/${someId}`, ...engineerWrite, engineer: 404, admin: 404 },
  { route: 'GET /api/orbit/snapshots', ...staffRead, outreach: 200, engineer: 200, admin: 200 },
  { route: 'POST /api/orbit/snapshots', ...engineerWrite, engineer: 400, admin: 400 },
  { route: 'GET /api/orbit/snapshots/:id', sample: `/api/orbit/snapshots/${someId}`, ...staffRead, outreach: 404, engineer: 404, admin: 404 },
  { route: 'PATCH /api/orbit/snapshots/:id', sample: `/api/orbit/snapshots/${someId}`, ...engineerWrite, engineer: 404, admin: 404 },
  { route: 'DELETE /api/orbit/snapshots/:id', sample: `/api/orbit/snapshots/${someId}`, ...engineerWrite, engineer: 404, admin: 404 },
  { route: 'GET /api/orbit/snapshots/:id/chart.svg', sample: `/api/orbit/snapshots/${someId}/chart.svg`, ...staffRead, outreach: 404, engineer: 404, admin: 404 },
  { route: 'GET /api/orbit/snapshots/:id/chart.png', sample: `/api/orbit/snapshots/${someId}/chart.png`, ...staffRead, outreach: 404, engineer: 404, admin: 404 },
  { route: 'GET /api/public/orbit/:slug', sample: '/api/public/orbit/tern-1', anon: 404, backer: 404, outreach: 404, engineer: 404, finance: 404, admin: 404 },
  { route: 'GET /api/public/snapshots/:slug.svg', sample: '/api/public/snapshots/tern-1-abc.svg', anon: 404, backer: 404, outreach: 404, engineer: 404, finance: 404, admin: 404 },
  { route: 'GET /api/public/snapshots/:slug.png', sample: '/api/public/snapshots/tern-1-abc.png', anon: 404, backer: 404, outreach: 404, engineer: 404, finance: 404, admin: 404 },
  { route: 'GET /api/public/snapshots/:slug', sample: '/api/public/snapshots/tern-1-abc', anon: 404, backer: 404, outreach: 404, engineer: 404, finance: 404, admin: 404 },
];
