import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestApp, agentFor, signIn, type TestApp, type Agent } from '../setup/test-app';
import { seedDemoAccounts, DEMO_PASSWORD } from '../../server/demo/accounts';
import { routesOf } from '../../server/lib/routes';
import { rbacTable, type Caller } from './rbac.table';

let t: TestApp;
const agents = {} as Record<Caller, Agent>;
const callers: Caller[] = ['anon', 'backer', 'outreach', 'engineer', 'finance', 'admin'];

beforeAll(async () => {
  t = await createTestApp({ SIGN_IN_LIMIT_PER_IP: '1000' });
  await seedDemoAccounts(t.database.db);
  for (const c of callers) {
    agents[c] = agentFor(t.app);
    if (c === 'anon') await agents[c].token();
    else await signIn(agents[c], `${c}@saltmarsh.example`, DEMO_PASSWORD);
  }
});
afterAll(async () => t.close());

describe('RBAC matrix', () => {
  it('lists every route the app serves, and nothing it does not serve', () => {
    const served = routesOf(t.app)
      .map((r) => `${r.method} ${r.path}`)
      .sort();
    const listed = rbacTable.map((r) => r.route).sort();
    expect(
      served.filter((r) => !listed.includes(r)),
      'routes missing from the RBAC table',
    ).toEqual([]);
    expect(
      listed.filter((r) => !served.includes(r)),
      'table rows for routes that do not exist',
    ).toEqual([]);
  });

  for (const row of rbacTable) {
    it(`${row.route}`, async () => {
      const [method, path] = row.route.split(' ') as [string, string];
      const url = row.sample ?? path;
      for (const c of callers) {
        if (c !== 'anon' && (row as { skipSignedIn?: boolean }).skipSignedIn) continue;
        // A row that ends the session runs on a throwaway anonymous agent.
        const agent = (row as { skipSignedIn?: boolean }).skipSignedIn ? agentFor(t.app) : agents[c];
        if (agent !== agents[c]) await agent.token();
        const m = method.toLowerCase() as 'get' | 'post' | 'patch' | 'put' | 'delete';
        let req = agent[m](url).redirects(0);
        if (method !== 'GET') req = req.set('x-csrf-token', agent.csrf).send(row.body ?? {});
        const res = await req;
        const want = row[c];
        if (want === 'ok') expect([401, 403], `${c} → ${res.status} ${JSON.stringify(res.body)}`).not.toContain(res.status);
        else expect(res.status, `${c}: ${JSON.stringify(res.body)}`).toBe(want);
      }
    });
  }
});
