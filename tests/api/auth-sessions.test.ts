import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sql } from 'drizzle-orm';
import { createTestApp, agentFor, signIn, signUpAndConfirm, type Agent, type TestApp } from '../setup/test-app';

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp({ SIGN_IN_LIMIT_PER_IP: '1000' });
});
afterAll(async () => {
  await t.close();
});

async function signUp(email: string, password: string) {
  const agent = agentFor(t.app);
  await agent.token();
  // Sign-up answers alike for new and known addresses and does not sign in; the confirmation link does.
  await signUpAndConfirm(t, agent, { email, password, displayName: 'Session Test' });
  return agent;
}

async function resetLinkToken(agent: Agent, email: string) {
  await agent.token();
  await agent.post('/api/auth/request-password-reset').set('x-csrf-token', agent.csrf).send({ email }).expect(202);
  await t.flushMail();
  const mail = t.mail
    .messages()
    .filter((m) => [m.to].flat().includes(email) && /reset/i.test(m.subject))
    .at(-1);
  const token = /reset-password\?token=([\w-]+)/.exec(String(mail?.html))?.[1];
  expect(token).toBeTruthy();
  return token!;
}

async function signedInAs(agent: Agent) {
  const res = await agent.get('/api/auth/me').expect(200);
  return (res.body.account as { email: string } | null)?.email ?? null;
}

async function sessionsOf(email: string) {
  const { rows } = await t.database.db.execute<{ n: number }>(
    sql`select count(*)::int as n from session s join accounts a on a.id::text = s.sess->'passport'->>'user' where a.email = ${email}`,
  );
  return rows[0]!.n;
}

describe('a password reset ends the account’s other sessions', () => {
  it('signs out every other browser of that account, leaves other accounts alone, and the new password signs in', async () => {
    await signUp('whimbrel@example.org', 'first password here');
    const laptop = agentFor(t.app);
    const phone = agentFor(t.app);
    await signIn(laptop, 'whimbrel@example.org', 'first password here');
    await signIn(phone, 'whimbrel@example.org', 'first password here');
    await signUp('curlew@example.org', 'someone else entirely');
    const bystander = agentFor(t.app);
    await signIn(bystander, 'curlew@example.org', 'someone else entirely');
    expect(await sessionsOf('whimbrel@example.org')).toBeGreaterThanOrEqual(3);

    // The reset happens in a signed-out browser, from the link in the mail.
    const resetter = agentFor(t.app);
    const token = await resetLinkToken(resetter, 'whimbrel@example.org');
    await resetter
      .post('/api/auth/reset-password')
      .set('x-csrf-token', resetter.csrf)
      .send({ token, password: 'second password here' })
      .expect(204);

    expect(await signedInAs(laptop)).toBeNull();
    expect(await signedInAs(phone)).toBeNull();
    expect(await sessionsOf('whimbrel@example.org')).toBe(0);
    expect(await signedInAs(bystander)).toBe('curlew@example.org');

    // The resetting browser's new session, made with the new password, stays.
    await signIn(resetter, 'whimbrel@example.org', 'second password here');
    expect(await signedInAs(resetter)).toBe('whimbrel@example.org');
    expect(await sessionsOf('whimbrel@example.org')).toBe(1);
  });

  it('keeps the session of the browser that made the reset when it is signed in to that account', async () => {
    await signUp('dunlin@example.org', 'first password here');
    const desk = agentFor(t.app);
    const stolen = agentFor(t.app);
    await signIn(desk, 'dunlin@example.org', 'first password here');
    await signIn(stolen, 'dunlin@example.org', 'first password here');

    const token = await resetLinkToken(desk, 'dunlin@example.org');
    await desk
      .post('/api/auth/reset-password')
      .set('x-csrf-token', desk.csrf)
      .send({ token, password: 'second password here' })
      .expect(204);

    expect(await signedInAs(desk)).toBe('dunlin@example.org');
    expect(await signedInAs(stolen)).toBeNull();
    expect(await sessionsOf('dunlin@example.org')).toBe(1);
  });

  it('ends nothing when the reset link is refused', async () => {
    await signUp('stint@example.org', 'first password here');
    const laptop = agentFor(t.app);
    await signIn(laptop, 'stint@example.org', 'first password here');
    const other = agentFor(t.app);
    await other.token();
    const res = await other
      .post('/api/auth/reset-password')
      .set('x-csrf-token', other.csrf)
      .send({ token: 'not-a-real-token-0123456789', password: 'second password here' });
    expect(res.status).toBe(400);
    expect(await signedInAs(laptop)).toBe('stint@example.org');
  });
});
