import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sql } from 'drizzle-orm';
import type { Express } from 'express';
import { createTestApp, agentFor, confirmationToken, type TestApp } from '../setup/test-app';

// Behind a proxy (TRUST_PROXY=true) the client address is the proxy's X-Forwarded-For, so each test speaks
// from addresses of its own (RFC 5737 documentation ranges).
let t: TestApp;
let direct: TestApp;
const limits = {
  SIGN_IN_LIMIT_PER_IP: '6',
  SIGN_IN_LIMIT_PER_ACCOUNT: '3',
  SIGN_UP_LIMIT_PER_IP: '3',
  PASSWORD_RESET_LIMIT_PER_IP: '3',
  // Long enough that a slow machine cannot let a wait run out between two requests; tests move time instead.
  SIGN_IN_FIRST_DELAY_SECONDS: '30',
};
beforeAll(async () => {
  t = await createTestApp({ ...limits, TRUST_PROXY: 'true' });
  direct = await createTestApp(limits);
});
afterAll(async () => {
  await t.close();
  await direct.close();
});

async function client(app: Express, address: string) {
  const agent = agentFor(app);
  agent.set('X-Forwarded-For', address);
  await agent.token();
  // A sign-in or sign-up that succeeds makes a new session, whose CSRF token the next request needs.
  const rotating = async (res: Awaited<ReturnType<typeof agent.get>>) => {
    if (res.status < 300) await agent.token();
    return res;
  };
  return {
    signIn: async (email: string, password: string) =>
      rotating(await agent.post('/api/auth/sign-in').set('x-csrf-token', agent.csrf).send({ email, password })),
    signUp: async (email: string, password: string) =>
      rotating(await agent.post('/api/auth/sign-up').set('x-csrf-token', agent.csrf).send({ email, password, displayName: 'Limit Test' })),
    requestReset: (email: string) => agent.post('/api/auth/request-password-reset').set('x-csrf-token', agent.csrf).send({ email }),
    signOut: async () => {
      await agent.token();
      await agent.post('/api/auth/sign-out').set('x-csrf-token', agent.csrf).expect(204);
      await agent.token();
    },
  };
}

/** Lets `seconds` pass for every stored limit (the counters keep their times in PostgreSQL). */
async function letTimePass(app: TestApp, seconds: number) {
  await app.database.db.execute(sql`update rate_limit_hits set reset_at = reset_at - make_interval(secs => ${seconds})`);
}

async function account(email: string, password: string, address: string) {
  const c = await client(t.app, address);
  expect((await c.signUp(email, password)).status).toBe(202);
  // The password signs in once the address is confirmed through the link in the mail (here in a browser of its own).
  const confirming = agentFor(t.app);
  await confirming.token();
  await confirming
    .post('/api/auth/verify-email')
    .set('x-csrf-token', confirming.csrf)
    .send({ token: await confirmationToken(t, email) })
    .expect(200);
}

describe('sign-in limits', () => {
  it('counts only failures: many successful sign-ins from one address are never refused', async () => {
    await account('gannet@example.org', 'gannet password 1', '198.51.100.10');
    const c = await client(t.app, '198.51.100.11');
    for (let i = 0; i < 10; i++) {
      expect((await c.signIn('gannet@example.org', 'gannet password 1')).status, `sign-in ${i + 1}`).toBe(200);
      await c.signOut();
    }
  });

  it('limits failures per address across accounts (429 with Retry-After), and another address is not affected', async () => {
    await account('shag@example.org', 'shag password 12', '198.51.100.20');
    const sprayer = await client(t.app, '198.51.100.21');
    for (let i = 0; i < 6; i++) expect((await sprayer.signIn(`nobody${i}@example.org`, 'guess guess')).status).toBe(401);
    const refused = await sprayer.signIn('shag@example.org', 'shag password 12');
    expect(refused.status).toBe(429);
    expect(Number(refused.headers['retry-after'])).toBeGreaterThan(0);
    expect(refused.body.error.code).toBe('auth.rate_limited');
    const elsewhere = await client(t.app, '198.51.100.22');
    expect((await elsewhere.signIn('shag@example.org', 'shag password 12')).status).toBe(200);
  });

  it('slows down failures on one account instead of locking it: the right password from a clean address signs in', async () => {
    await account('eider@example.org', 'eider password 1', '198.51.100.30');
    const guesser = await client(t.app, '198.51.100.31');
    for (let i = 0; i < 3; i++) expect((await guesser.signIn('EIDER@example.org', `wrong ${i}`)).status).toBe(401);

    // The next attempt from the failing address comes too fast: 429, told how long to wait (the first delay).
    const tooFast = await guesser.signIn('eider@example.org', 'wrong again');
    expect(tooFast.status).toBe(429);
    expect(Number(tooFast.headers['retry-after'])).toBeGreaterThan(25);
    expect(Number(tooFast.headers['retry-after'])).toBeLessThanOrEqual(30);
    expect(tooFast.body.error.message).toMatch(/wait/i);

    // The owner, from an address that has not been failing, is not held back.
    const owner = await client(t.app, '198.51.100.32');
    expect((await owner.signIn('eider@example.org', 'eider password 1')).status).toBe(200);

    // After the wait, the guesser's attempt is heard again (and the next wait doubles).
    await letTimePass(t, 30);
    expect((await guesser.signIn('eider@example.org', 'wrong 4')).status).toBe(401);
    const again = await guesser.signIn('eider@example.org', 'wrong 5');
    expect(again.status).toBe(429);
    expect(Number(again.headers['retry-after'])).toBeGreaterThan(55);
    expect(Number(again.headers['retry-after'])).toBeLessThanOrEqual(60);

    // Even from the failing address, the right password after the wait signs in: nothing is locked.
    await letTimePass(t, 60);
    expect((await guesser.signIn('eider@example.org', 'eider password 1')).status).toBe(200);
  });

  it('keeps separate budgets for sign-in, sign-up and reset requests', async () => {
    await account('skua@example.org', 'skua password 12', '198.51.100.40');
    const a = await client(t.app, '198.51.100.41');
    for (let i = 0; i < 6; i++) await a.signIn(`ghost${i}@example.org`, 'guess guess');
    expect((await a.signIn('skua@example.org', 'skua password 12')).status).toBe(429);
    // Sign-in failures do not use up sign-up or reset requests.
    expect((await a.signUp('auk@example.org', 'auk password 123')).status).toBe(202);
    expect((await a.requestReset('skua@example.org')).status).toBe(202);

    const b = await client(t.app, '198.51.100.42');
    for (let i = 0; i < 3; i++) expect((await b.requestReset(`reset${i}@example.org`)).status).toBe(202);
    const fourth = await b.requestReset('reset3@example.org');
    expect(fourth.status).toBe(429);
    expect(Number(fourth.headers['retry-after'])).toBeGreaterThan(0);
    expect((await b.signIn('skua@example.org', 'skua password 12')).status).toBe(200);

    const c = await client(t.app, '198.51.100.43');
    for (let i = 0; i < 3; i++) expect((await c.signUp(`puffin${i}@example.org`, 'puffin password 1')).status).toBe(202);
    expect((await c.signUp('puffin3@example.org', 'puffin password 1')).status).toBe(429);
    expect((await c.requestReset('skua@example.org')).status).toBe(202);
  });

  it('without TRUST_PROXY, X-Forwarded-For is ignored: the socket address is counted', async () => {
    for (let i = 0; i < 6; i++) {
      const c = await client(direct.app, `203.0.113.${i + 1}`);
      expect((await c.signIn(`stranger${i}@example.org`, 'guess guess')).status).toBe(401);
    }
    const c = await client(direct.app, '203.0.113.99');
    expect((await c.signIn('stranger9@example.org', 'guess guess')).status).toBe(429);
  });
});
