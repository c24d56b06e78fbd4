import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestApp, agentFor, signIn, type TestApp, type Agent } from '../setup/test-app';
import { seedDemoAccounts, DEMO_PASSWORD } from '../../server/demo/accounts';

let t: TestApp;
let admin: Agent;
let ids: Record<string, string>;
beforeAll(async () => {
  t = await createTestApp();
  ids = await seedDemoAccounts(t.database.db);
  admin = agentFor(t.app);
  await signIn(admin, 'admin@saltmarsh.example', DEMO_PASSWORD);
});
afterAll(async () => t.close());

describe('people: roles and the audit log', () => {
  it('grants and revokes a role, and records each change with before and after', async () => {
    const backerId = ids['backer@saltmarsh.example']!;
    const granted = await admin
      .post(`/api/admin/accounts/${backerId}/roles`)
      .set('x-csrf-token', admin.csrf)
      .send({ role: 'outreach' })
      .expect(200);
    expect(granted.body.account.roles).toEqual(['backer', 'outreach']);

    const backer = agentFor(t.app);
    await signIn(backer, 'backer@saltmarsh.example', DEMO_PASSWORD);
    expect((await backer.get('/api/auth/me')).body.account.roles).toContain('outreach');

    const revoked = await admin.delete(`/api/admin/accounts/${backerId}/roles/outreach`).set('x-csrf-token', admin.csrf).expect(200);
    expect(revoked.body.account.roles).toEqual(['backer']);
    // The role is gone at the next request of the same session: authorization is read from the database.
    expect((await backer.get('/api/auth/me')).body.account.roles).toEqual(['backer']);

    const audit = await admin.get('/api/admin/audit').expect(200);
    const [last, prev] = audit.body.entries;
    expect(last).toMatchObject({
      action: 'role.revoked',
      subjectId: backerId,
      before: { roles: ['backer', 'outreach'] },
      after: { roles: ['backer'] },
    });
    expect(last.actor.email).toBe('admin@saltmarsh.example');
    expect(prev).toMatchObject({ action: 'role.granted', after: { roles: ['backer', 'outreach'] } });
  });

  it('refuses to remove the last admin with 409', async () => {
    const res = await admin.delete(`/api/admin/accounts/${ids['admin@saltmarsh.example']}/roles/admin`).set('x-csrf-token', admin.csrf);
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('admin.last_admin');
    const me = await admin.get('/api/auth/me').expect(200);
    expect(me.body.account.roles).toContain('admin');
  });

  it('lets one of two admins step down, then protects the other', async () => {
    const engId = ids['engineer@saltmarsh.example']!;
    await admin.post(`/api/admin/accounts/${engId}/roles`).set('x-csrf-token', admin.csrf).send({ role: 'admin' }).expect(200);
    await admin.delete(`/api/admin/accounts/${engId}/roles/admin`).set('x-csrf-token', admin.csrf).expect(200);
    await admin.delete(`/api/admin/accounts/${ids['admin@saltmarsh.example']}/roles/admin`).set('x-csrf-token', admin.csrf).expect(409);
  });

  it('validates the role and the account id', async () => {
    const bad = await admin.post(`/api/admin/accounts/not-a-uuid/roles`).set('x-csrf-token', admin.csrf).send({ role: 'captain' });
    expect(bad.status).toBe(400);
    expect(bad.body.error.details.map((d: { path: string }) => d.path).sort()).toEqual(['body.role', 'params.id']);
    const missing = await admin
      .post(`/api/admin/accounts/00000000-0000-4000-8000-000000000000/roles`)
      .set('x-csrf-token', admin.csrf)
      .send({ role: 'finance' });
    expect(missing.status).toBe(404);
  });

  it('finds accounts by part of the e-mail', async () => {
    const res = await admin.get('/api/admin/accounts?q=financ').expect(200);
    expect(res.body.accounts.map((a: { email: string }) => a.email)).toEqual(['finance@saltmarsh.example']);
  });
});
