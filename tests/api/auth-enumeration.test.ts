import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestApp, agentFor, type TestApp } from '../setup/test-app';
import { seedDemoAccounts } from '../../server/demo/accounts';

// Issue 8 item 3: sign-up and forgot-password must not tell which addresses have accounts, by body or by time.
let t: TestApp;
beforeAll(async () => {
  t = await createTestApp({ SIGN_IN_LIMIT_PER_IP: '100000' });
  await seedDemoAccounts(t.database.db);
});
afterAll(async () => t.close());

async function post(path: string, body: object) {
  const agent = agentFor(t.app);
  await agent.token();
  const started = process.hrtime.bigint();
  const res = await agent.post(path).set('x-csrf-token', agent.csrf).send(body);
  return { res, ms: Number(process.hrtime.bigint() - started) / 1e6 };
}

const median = (xs: number[]) => {
  const s = [...xs].sort((a, b) => a - b);
  return s.length % 2 ? s[(s.length - 1) / 2]! : (s[s.length / 2 - 1]! + s[s.length / 2]!) / 2;
};

describe('no account enumeration', () => {
  it('sign-up with a known e-mail answers exactly as a new sign-up, and the owner is told by mail', async () => {
    const fresh = await post('/api/auth/sign-up', {
      email: 'new.tern@example.org',
      password: 'a long new password',
      displayName: 'New Tern',
    });
    const known = await post('/api/auth/sign-up', {
      email: 'BACKER@saltmarsh.example',
      password: 'a long new password',
      displayName: 'Someone',
    });
    expect(known.res.status).toBe(fresh.res.status);
    expect(known.res.body).toEqual(fresh.res.body);
    expect(Object.keys(known.res.headers).sort()).toEqual(Object.keys(fresh.res.headers).sort());
    await t.flushMail();
    const toOwner = t.mail.messages().filter((m) => m.to.includes('backer@saltmarsh.example'));
    expect(toOwner.map((m) => m.subject)).toEqual(['Someone tried to sign up to Lightkeel with your address']);
    const toNew = t.mail.messages().filter((m) => m.to.includes('new.tern@example.org'));
    expect(toNew.map((m) => m.subject)).toEqual(['Confirm your e-mail address for Lightkeel']);
    // A second attempt within the hour does not mail the owner again.
    await post('/api/auth/sign-up', { email: 'backer@saltmarsh.example', password: 'a long new password', displayName: 'Someone' });
    await t.flushMail();
    expect(t.mail.messages().filter((m) => m.to.includes('backer@saltmarsh.example'))).toHaveLength(1);
  });

  it('sign-up followed by a sign-in with the same password (what the client did) looks the same for a known and a new address', async () => {
    // Before the fix the second step signed a new address in (200) and refused a known one (401).
    const flow = async (email: string) => {
      const agent = agentFor(t.app);
      await agent.token();
      const up = await agent
        .post('/api/auth/sign-up')
        .set('x-csrf-token', agent.csrf)
        .send({ email, password: 'the same password', displayName: 'Prober' });
      const meAfterUp = (await agent.get('/api/auth/me')).body;
      await agent.token();
      const inRes = await agent.post('/api/auth/sign-in').set('x-csrf-token', agent.csrf).send({ email, password: 'the same password' });
      const meAfterIn = (await agent.get('/api/auth/me')).body;
      const headerNames = (h: Record<string, unknown>) =>
        Object.keys(h)
          .filter((k) => !['date', 'etag', 'content-length', 'ratelimit', 'ratelimit-policy'].includes(k))
          .sort();
      return {
        signUp: { status: up.status, body: up.body, headers: headerNames(up.headers) },
        meAfterUp,
        signIn: {
          status: inRes.status,
          body: inRes.body,
          headers: headerNames(inRes.headers),
          cookie: Boolean(inRes.headers['set-cookie']),
        },
        meAfterIn,
      };
    };
    const known = await flow('engineer@saltmarsh.example');
    const fresh = await flow('brand.new.shearwater@example.org');
    expect(fresh).toEqual(known);
    expect(known.signIn.status).toBe(401);
    expect(known.meAfterIn).toEqual({ account: null });
  });

  it('forgot-password answers the same body for known and unknown addresses; the mail goes out from the queue after', async () => {
    const known = await post('/api/auth/request-password-reset', { email: 'finance@saltmarsh.example' });
    const unknown = await post('/api/auth/request-password-reset', { email: 'nobody.here@example.org' });
    expect(known.res.status).toBe(202);
    expect(unknown.res.status).toBe(202);
    expect(unknown.res.body).toEqual(known.res.body);
    // Nothing was sent while answering: the job has not run yet.
    expect(t.mail.messages().filter((m) => m.to.includes('finance@saltmarsh.example'))).toHaveLength(0);
    await t.flushMail();
    expect(
      t.mail
        .messages()
        .filter((m) => m.to.includes('finance@saltmarsh.example'))
        .map((m) => m.subject),
    ).toEqual(['Reset your Lightkeel password']);
    expect(t.mail.messages().filter((m) => m.to.includes('nobody.here@example.org'))).toHaveLength(0);
  });

  it('forgot-password takes the same time for known and unknown addresses (medians of 15 requests each, interleaved)', async () => {
    const knownMs: number[] = [];
    const unknownMs: number[] = [];
    for (let i = 0; i < 3; i++) await post('/api/auth/request-password-reset', { email: `warm${i}@example.org` });
    for (let i = 0; i < 15; i++) {
      knownMs.push((await post('/api/auth/request-password-reset', { email: 'outreach@saltmarsh.example' })).ms);
      unknownMs.push((await post('/api/auth/request-password-reset', { email: `ghost${i}@example.org` })).ms);
    }
    const k = median(knownMs);
    const u = median(unknownMs);
    // Before the fix a known address took 2–4× as long (the route waited for the mail service). Now both do the
    // same single insert; allow 35 % or 3 ms of noise, whichever is larger.
    expect(Math.abs(k - u)).toBeLessThanOrEqual(Math.max(3, 0.35 * Math.min(k, u)));
  });
});
