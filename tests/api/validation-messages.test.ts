// A validation error says which part of the request is wrong (body, query string, address) and, for a
// body of the wrong shape, what was expected in words.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { agentFor, signIn, type Agent, type TestApp, createTestApp } from '../setup/test-app';
import { seedDemoAccounts, DEMO_PASSWORD } from '../../server/demo/accounts';

let t: TestApp;
let admin: Agent;
beforeAll(async () => {
  t = await createTestApp({ SIGN_IN_LIMIT_PER_IP: '1000' });
  await seedDemoAccounts(t.database.db);
  admin = agentFor(t.app);
  await signIn(admin, 'admin@saltmarsh.example', DEMO_PASSWORD);
});
afterAll(async () => t.close());

const paths = (body: { error: { details?: { path: string }[] } }) => (body.error.details ?? []).map((d) => d.path).sort();

describe('validation messages', () => {
  it('names the body when a JSON array comes where an object is expected', async () => {
    const res = await admin
      .patch('/api/account')
      .set('x-csrf-token', admin.csrf)
      .send([{ displayName: 'Ada' }]);
    expect(res.status).toBe(400);
    expect(paths(res.body)).toEqual(['body']);
    expect(res.body.error.details[0].message).toBe('The request body must be a JSON object with named fields, not a list (JSON array)');
    expect(res.body.error.message).not.toMatch(/expected object, received array/);
  });

  it('prefixes each field with the part it came from', async () => {
    const bodyField = await admin.patch('/api/account').set('x-csrf-token', admin.csrf).send({ displayName: '' });
    expect(paths(bodyField.body)).toEqual(['body.displayName']);
    const queryField = await admin.get('/api/admin/audit').query({ limit: 'lots' });
    expect(queryField.status).toBe(400);
    expect(paths(queryField.body)).toEqual(['query.limit']);
    const addressField = await admin.post('/api/admin/accounts/not-an-id/roles').set('x-csrf-token', admin.csrf).send({ role: 'finance' });
    expect(addressField.status).toBe(400);
    expect(paths(addressField.body)).toEqual(['params.id']);
    expect(addressField.body.error.message).toBe('params.id: must be an account id');
  });
});
