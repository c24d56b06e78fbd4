import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { sql } from 'drizzle-orm';
import { createTestApp, agentFor, signIn, signUpAndConfirm, confirmationToken, type TestApp } from '../setup/test-app';
import { seedDemoAccounts, DEMO_PASSWORD } from '../../server/demo/accounts';
import { createIdentityFake } from '../../fakes/identity/server';

let t: TestApp;
let idp: Awaited<ReturnType<typeof createIdentityFake>>;

beforeAll(async () => {
  idp = await createIdentityFake({ port: 0 });
  t = await createTestApp({
    GOOGLE_OAUTH_BASE_URL: idp.issuerUrl,
    SIGN_IN_LIMIT_PER_ACCOUNT: '3',
    SIGN_IN_FIRST_DELAY_SECONDS: '30',
    SIGN_IN_LIMIT_PER_IP: '1000',
  });
  await seedDemoAccounts(t.database.db);
});
afterAll(async () => {
  await t.close();
  await idp.close();
});

/** Signs up as the client does: the answer is the same for every address, and nobody is signed in. */
async function signUpOnly(email: string, password = 'correct horse battery', displayName = 'Test Backer') {
  const agent = agentFor(t.app);
  await agent.token();
  const res = await agent.post('/api/auth/sign-up').set('x-csrf-token', agent.csrf).send({ email, password, displayName });
  return { agent, res };
}

/** Signs up a new address and follows the link in its confirmation mail, which signs in. */
async function signUp(email: string, password = 'correct horse battery', displayName = 'Test Backer') {
  const agent = agentFor(t.app);
  const account = await signUpAndConfirm(t, agent, { email, password, displayName });
  return { agent, account };
}

describe('sign-up and sign-in', () => {
  it('creates a backer account that signs in through its confirmation link; the same e-mail in another case gets the very same answer and creates nothing', async () => {
    const { agent, res } = await signUpOnly('Petrel@Example.org');
    expect(res.status).toBe(202);
    // Signed out until the link is followed; the password does not sign in before then.
    expect((await agent.get('/api/auth/me').expect(200)).body.account).toBeNull();
    const early = await agent
      .post('/api/auth/sign-in')
      .set('x-csrf-token', agent.csrf)
      .send({ email: 'Petrel@Example.org', password: 'correct horse battery' });
    expect(early.status).toBe(401);
    expect(early.body.error.code).toBe('auth.invalid_credentials');

    const again = await signUpOnly('petrel@example.ORG', 'another password entirely');
    expect(again.res.status).toBe(res.status);
    expect(again.res.body).toEqual(res.body);
    expect((await again.agent.get('/api/auth/me')).body.account).toBeNull();
    const { rows } = await t.database.pool.query("select count(*)::int as n from accounts where lower(email) = 'petrel@example.org'");
    expect(rows[0].n).toBe(1);

    const token = await confirmationToken(t, 'Petrel@Example.org');
    await agent.token();
    const confirmed = await agent.post('/api/auth/verify-email').set('x-csrf-token', agent.csrf).send({ token }).expect(200);
    expect(confirmed.body.account).toMatchObject({ email: 'Petrel@Example.org', roles: ['backer'], emailVerified: true });
    await agent.token();
    const me = await agent.get('/api/auth/me').expect(200);
    expect(me.body.account.email).toBe('Petrel@Example.org');
    // Now the password signs in too (in another browser).
    await signIn(agentFor(t.app), 'petrel@example.org', 'correct horse battery');
  });

  it('sends a confirmation mail whose link confirms the address once, signing in a new session', async () => {
    const { agent } = await signUpOnly('sandpiper@example.org');
    await t.flushMail();
    const mail = t.mail.messages().find((m) => [m.to].flat().includes('sandpiper@example.org'));
    expect(mail?.subject).toMatch(/confirm|verify/i);
    const token = /verify-email\?token=([\w-]+)/.exec(String(mail?.html))?.[1];
    expect(token).toBeTruthy();
    const pre = await agent.get('/api/auth/csrf');
    const before = /lk\.sid=([^;]+)/.exec(String(pre.headers['set-cookie']))?.[1];
    const res = await agent.post('/api/auth/verify-email').set('x-csrf-token', pre.body.csrfToken).send({ token }).expect(200);
    const after = /lk\.sid=([^;]+)/.exec(String(res.headers['set-cookie']))?.[1];
    expect(after).toBeTruthy();
    expect(after).not.toBe(before);
    expect((await agent.get('/api/auth/me')).body.account.emailVerified).toBe(true);
    await agent.token();
    const again = await agent.post('/api/auth/verify-email').set('x-csrf-token', agent.csrf).send({ token });
    expect(again.status).toBe(400);
    expect(again.body.error.code).toBe('auth.token_invalid');
  });

  it('answers a wrong password and an unknown e-mail with the same 401 message', async () => {
    const a = agentFor(t.app);
    await a.token();
    const wrong = await a
      .post('/api/auth/sign-in')
      .set('x-csrf-token', a.csrf)
      .send({ email: 'engineer@saltmarsh.example', password: 'not the password' });
    const unknown = await a
      .post('/api/auth/sign-in')
      .set('x-csrf-token', a.csrf)
      .send({ email: 'nobody@saltmarsh.example', password: 'not the password' });
    expect(wrong.status).toBe(401);
    expect(unknown.status).toBe(401);
    expect(wrong.body.error.message).toBe(unknown.body.error.message);
    expect(wrong.body.error.message).not.toMatch(/exist|unknown|no account/i);
  });

  it('regenerates the session id at sign-in and destroys the session at sign-out', async () => {
    const agent = agentFor(t.app);
    const pre = await agent.get('/api/auth/csrf');
    const before = /lk\.sid=([^;]+)/.exec(String(pre.headers['set-cookie']))?.[1];
    await agent
      .post('/api/auth/sign-in')
      .set('x-csrf-token', pre.body.csrfToken)
      .send({ email: 'admin@saltmarsh.example', password: DEMO_PASSWORD })
      .expect(200)
      .then((res) => {
        const after = /lk\.sid=([^;]+)/.exec(String(res.headers['set-cookie']))?.[1];
        expect(after).toBeTruthy();
        expect(after).not.toBe(before);
        expect(String(res.headers['set-cookie'])).toMatch(/HttpOnly/i);
        expect(String(res.headers['set-cookie'])).toMatch(/SameSite=Lax/i);
      });
    await agent.token();
    await agent.post('/api/auth/sign-out').set('x-csrf-token', agent.csrf).expect(204);
    expect((await agent.get('/api/auth/me').expect(200)).body).toEqual({ account: null });
  });

  it('keeps a session across an app restart (sessions live in PostgreSQL)', async () => {
    const agent = agentFor(t.app);
    await signIn(agent, 'finance@saltmarsh.example', DEMO_PASSWORD);
    const cookie = (await agent.get('/api/auth/me').expect(200)).request.cookies;
    const restarted = t.rebuild();
    const res = await request(restarted).get('/api/auth/me').set('Cookie', cookie).expect(200);
    expect(res.body.account.roles).toContain('finance');
    const [row] = (await t.database.db.execute(sql`select count(*)::int as n from session`)).rows as { n: number }[];
    expect(row!.n).toBeGreaterThan(0);
  });

  it('rejects a state-changing request without the CSRF token with 403', async () => {
    const agent = agentFor(t.app);
    const res = await agent.post('/api/auth/sign-in').send({ email: 'admin@saltmarsh.example', password: DEMO_PASSWORD });
    expect(res.status).toBe(403);
    expect(res.body.error.code).toBe('csrf.invalid');
    const forged = await agent
      .post('/api/auth/sign-in')
      .set('x-csrf-token', 'forged-token')
      .send({ email: 'admin@saltmarsh.example', password: DEMO_PASSWORD });
    expect(forged.status).toBe(403);
  });

  it('slows failed sign-ins per account with 429 and Retry-After, and lets the right password in after the wait', async () => {
    await signUp('tern@example.org', 'a good long password');
    const agent = agentFor(t.app);
    await agent.token();
    const statuses: number[] = [];
    let last;
    for (let i = 0; i < 5; i++) {
      last = await agent
        .post('/api/auth/sign-in')
        .set('x-csrf-token', agent.csrf)
        .send({ email: 'TERN@example.org', password: `wrong guess ${i}` });
      statuses.push(last.status);
    }
    expect(statuses).toEqual([401, 401, 401, 429, 429]);
    expect(Number(last!.headers['retry-after'])).toBeGreaterThan(25);
    expect(Number(last!.headers['retry-after'])).toBeLessThanOrEqual(30);
    // Too soon, even with the right password: this address has been failing.
    const early = await agent
      .post('/api/auth/sign-in')
      .set('x-csrf-token', agent.csrf)
      .send({ email: 'tern@example.org', password: 'a good long password' });
    expect(early.status).toBe(429);
    // Once the wait is over the right password signs in: nothing is locked.
    await t.database.db.execute(sql`update rate_limit_hits set reset_at = reset_at - interval '30 seconds'`);
    await agent
      .post('/api/auth/sign-in')
      .set('x-csrf-token', agent.csrf)
      .send({ email: 'tern@example.org', password: 'a good long password' })
      .expect(200);
  });
});

describe('password reset through the mail fake', () => {
  it('resets a password with the single-use link from the stored message', async () => {
    await signUp('godwit@example.org', 'first password here');
    const agent = agentFor(t.app);
    await agent.token();
    await agent.post('/api/auth/request-password-reset').set('x-csrf-token', agent.csrf).send({ email: 'godwit@example.org' }).expect(202);
    await t.flushMail();
    const mail = t.mail
      .messages()
      .filter((m) => [m.to].flat().includes('godwit@example.org'))
      .find((m) => /reset/i.test(m.subject));
    expect(mail).toBeTruthy();
    const token = /reset-password\?token=([\w-]+)/.exec(String(mail!.text ?? mail!.html))?.[1];
    expect(token).toBeTruthy();
    await agent
      .post('/api/auth/reset-password')
      .set('x-csrf-token', agent.csrf)
      .send({ token, password: 'second password here' })
      .expect(204);
    await signIn(agentFor(t.app), 'godwit@example.org', 'second password here');
    const reused = await agent
      .post('/api/auth/reset-password')
      .set('x-csrf-token', agent.csrf)
      .send({ token, password: 'third password here' });
    expect(reused.status).toBe(400);
    expect(reused.body.error.code).toBe('auth.token_invalid');
  });

  it('refuses an expired reset token', async () => {
    await signUp('knot@example.org', 'first password here');
    const agent = agentFor(t.app);
    await agent.token();
    await agent.post('/api/auth/request-password-reset').set('x-csrf-token', agent.csrf).send({ email: 'knot@example.org' }).expect(202);
    await t.flushMail();
    const mail = t.mail.messages().find((m) => [m.to].flat().includes('knot@example.org') && /reset/i.test(m.subject));
    const token = /reset-password\?token=([\w-]+)/.exec(String(mail!.html))?.[1];
    await t.database.db.execute(sql`update auth_tokens set expires_at = now() - interval '1 minute' where purpose = 'reset-password'`);
    const res = await agent
      .post('/api/auth/reset-password')
      .set('x-csrf-token', agent.csrf)
      .send({ token, password: 'second password here' });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('auth.token_invalid');
  });

  it('answers 202 for an unknown e-mail and sends nothing', async () => {
    const before = t.mail.messages().length;
    const agent = agentFor(t.app);
    await agent.token();
    await agent.post('/api/auth/request-password-reset').set('x-csrf-token', agent.csrf).send({ email: 'ghost@example.org' }).expect(202);
    await t.flushMail();
    expect(t.mail.messages().length).toBe(before);
  });
});

describe('Continue with Google (local identity provider)', () => {
  /** The browser's side up to the provider's redirect back: answers the callback link it would follow. */
  async function startGoogleFlow(agent: ReturnType<typeof agentFor>, returnTo = '/my-support') {
    const start = await agent.get(`/api/auth/google?returnTo=${encodeURIComponent(returnTo)}`).expect(302);
    const authorize = new URL(start.headers.location!);
    expect(authorize.origin).toBe(new URL(idp.issuerUrl).origin);
    const back = await fetch(authorize, { redirect: 'manual' });
    expect(back.status).toBe(302);
    const callback = new URL(back.headers.get('location')!);
    expect(callback.pathname).toBe('/api/auth/google/callback');
    return { authorize, callback: callback.pathname + callback.search };
  }

  async function googleRoundTrip(agent: ReturnType<typeof agentFor>, returnTo = '/my-support') {
    const { callback } = await startGoogleFlow(agent, returnTo);
    return agent.get(callback);
  }

  async function accountExists(email: string) {
    const { rows } = await t.database.db.execute(sql`select 1 from accounts where lower(email) = lower(${email})`);
    return rows.length > 0;
  }

  it('sends a state bound to the session and an S256 PKCE challenge to the provider', async () => {
    const agent = agentFor(t.app);
    const { authorize } = await startGoogleFlow(agent);
    const state = authorize.searchParams.get('state');
    expect(state).toMatch(/^[\w-]{20,}$/);
    expect(authorize.searchParams.get('code_challenge')).toMatch(/^[\w-]{43}$/);
    expect(authorize.searchParams.get('code_challenge_method')).toBe('S256');
    const other = await startGoogleFlow(agentFor(t.app));
    expect(other.authorize.searchParams.get('state')).not.toBe(state);
  });

  it('does not sign in a browser that follows a callback link from a flow another browser started', async () => {
    // The attacker starts a sign-in with their own Google account and stops before the callback…
    idp.setNextProfile({ sub: 'g-attacker', email: 'mallard.attacker@example.org', email_verified: true, name: 'Attacker' });
    const attacker = agentFor(t.app);
    const { callback } = await startGoogleFlow(attacker);

    // …and sends the callback link to a victim: one fresh browser, one that has started its own sign-in.
    const fresh = agentFor(t.app);
    const busy = agentFor(t.app);
    await startGoogleFlow(busy);
    for (const victim of [fresh, busy]) {
      const res = await victim.get(callback);
      expect(res.status).toBe(302);
      expect(res.headers.location).toBe('/sign-in?error=auth.state_mismatch');
      expect((await victim.get('/api/auth/me').expect(200)).body).toEqual({ account: null });
    }
    expect(await accountExists('mallard.attacker@example.org')).toBe(false);
  });

  it('refuses a callback without state, or with a state it made up, and signs nobody in', async () => {
    idp.setNextProfile({ sub: 'g-nostate', email: 'nostate@example.org', email_verified: true, name: 'No State' });
    const agent = agentFor(t.app);
    const { callback } = await startGoogleFlow(agent);
    const url = new URL(callback, 'http://x');
    const code = url.searchParams.get('code')!;
    for (const search of [`?code=${code}`, `?code=${code}&state=made-up-state-value-000000`]) {
      const res = await agent.get(`/api/auth/google/callback${search}`);
      expect(res.headers.location).toBe('/sign-in?error=auth.state_mismatch');
    }
    // The flow's own state was spent by the first refused attempt: the genuine link no longer works either.
    expect((await agent.get(callback)).headers.location).toBe('/sign-in?error=auth.state_mismatch');
    expect((await agent.get('/api/auth/me')).body).toEqual({ account: null });
    expect(await accountExists('nostate@example.org')).toBe(false);
  });

  it('creates an account on the first sign-in and returns to the asked page', async () => {
    idp.setNextProfile({ sub: 'g-1001', email: 'oystercatcher@example.org', email_verified: true, name: 'Oyster Catcher' });
    const agent = agentFor(t.app);
    const res = await googleRoundTrip(agent, '/my-support');
    expect(res.status).toBe(302);
    expect(res.headers.location).toBe('/my-support');
    const me = await agent.get('/api/auth/me').expect(200);
    expect(me.body.account.email).toBe('oystercatcher@example.org');
    expect(me.body.account.emailVerified).toBe(true);
    expect(me.body.account.roles).toEqual(['backer']);
  });

  it('links to an existing account with the same verified e-mail', async () => {
    idp.setNextProfile({ sub: 'g-2002', email: 'engineer@saltmarsh.example', email_verified: true, name: 'Ravi' });
    const agent = agentFor(t.app);
    await googleRoundTrip(agent);
    const me = await agent.get('/api/auth/me').expect(200);
    expect(me.body.account.roles).toContain('engineer');
    const { rows } = await t.database.db.execute(
      sql`select provider, subject from identities i join accounts a on a.id = i.account_id where a.email = 'engineer@saltmarsh.example' order by provider`,
    );
    expect(rows).toEqual([
      { provider: 'google', subject: 'g-2002' },
      { provider: 'password', subject: null },
    ]);
  });

  it('refuses a profile whose e-mail is not verified', async () => {
    idp.setNextProfile({ sub: 'g-3003', email: 'unverified@example.org', email_verified: false, name: 'Unverified' });
    const agent = agentFor(t.app);
    const res = await googleRoundTrip(agent);
    expect(res.status).toBe(302);
    expect(res.headers.location).toBe('/sign-in?error=auth.email_unverified');
    expect((await agent.get('/api/auth/me').expect(200)).body).toEqual({ account: null });
  });
});
