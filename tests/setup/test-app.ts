import request from 'supertest';
import type { Express } from 'express';
import { loadConfig, type Config } from '../../server/config';
import { createApp } from '../../server/app';
import { createMailerFromConfig, createStripeFromConfig } from '../../server/deps';
import { createTestDatabase, type TestDatabase } from './test-db';
import { createMailFake } from '../../fakes/mail/server';
import { createMailSender, mailSenderOptionsFrom } from '../../server/jobs/mail-sender';
import pino from 'pino';
import { createJobs, type Jobs } from '../../server/jobs';

export type TestApp = {
  app: Express;
  config: Config;
  database: TestDatabase;
  mail: Awaited<ReturnType<typeof createMailFake>>;
  jobs: Jobs;
  /** Runs the waiting jobs, then sends what the mail queue holds now (what a worker does), through the SDK to the mail fake. */
  flushMail: () => Promise<number>;
  /** Builds another app instance on the same database (e.g. to test a restart). */
  rebuild: () => Express;
  close: () => Promise<void>;
};

export async function createTestApp(env: Record<string, string> = {}, opts: { keepMail?: boolean } = {}): Promise<TestApp> {
  const database = await createTestDatabase();
  const mail = await createMailFake({ port: 0, apiKey: 're_test_key' });
  const config = loadConfig({
    NODE_ENV: 'test',
    LOG_LEVEL: 'silent',
    DATABASE_URL: database.url,
    PUBLIC_URL: 'http://127.0.0.1:3999',
    RESEND_API_KEY: 're_test_key',
    RESEND_BASE_URL: mail.url,
    SESSION_SECRET: 'test-session-secret-0123456789',
    ...env,
  });
  // The app enqueues through pg-boss on the test database; tests run the waiting jobs with flushMail/runJobs.
  const jobs = createJobs({ pool: database.pool, db: database.db, config, logger: pino({ level: 'silent' }) });
  await jobs.start();
  const build = () =>
    createApp({
      jobs,
      db: database.db,
      pool: database.pool,
      config,
      mailer: createMailerFromConfig(config),
      stripe: createStripeFromConfig(config),
    });
  const app = build();
  const sender = createMailSender(database.pool, mailSenderOptionsFrom({ config, deps: {} }), pino({ level: 'silent' }));
  return {
    app,
    config,
    database,
    mail,
    jobs,
    flushMail: async () => {
      await jobs.runPending();
      return sender.drain();
    },
    rebuild: build,
    close: async () => {
      await jobs.stop();
      if (!opts.keepMail) await mail.close();
      await database.drop();
    },
  };
}

/** An agent with a CSRF token for its session; `token()` fetches a fresh one (after sign-in the session changes). */
export function agentFor(app: Express) {
  const agent = request.agent(app) as ReturnType<typeof request.agent> & { csrf: string; token: () => Promise<string> };
  agent.csrf = '';
  agent.token = async () => {
    const res = await agent.get('/api/auth/csrf').expect(200);
    agent.csrf = res.body.csrfToken;
    return agent.csrf;
  };
  return agent;
}
export type Agent = ReturnType<typeof agentFor>;

export async function signIn(agent: Agent, email: string, password: string) {
  await agent.token();
  const res = await agent.post('/api/auth/sign-in').set('x-csrf-token', agent.csrf).send({ email, password });
  if (res.status !== 200) throw new Error(`sign-in failed: ${res.status} ${JSON.stringify(res.body)}`);
  await agent.token();
  return res.body.account;
}

/** The token of the newest confirmation link mailed to `email` (runs the mail queue first). */
export async function confirmationToken(t: TestApp, email: string) {
  await t.flushMail();
  const mail = t.mail
    .messages()
    .filter((m) => [m.to].flat().some((to) => to.toLowerCase() === email.toLowerCase()) && /verify-email\?token=/.test(String(m.html)))
    .at(-1);
  const token = /verify-email\?token=([\w-]+)/.exec(String(mail?.html))?.[1];
  if (!token) throw new Error(`no confirmation link was mailed to ${email}`);
  return token;
}

/**
 * Signs up as the client does, then follows the link in the confirmation mail (which signs in): a new account's only
 * way in before its address is confirmed. Returns the signed-in account.
 */
export async function signUpAndConfirm(t: TestApp, agent: Agent, input: { email: string; password: string; displayName: string }) {
  await agent.token();
  const res = await agent.post('/api/auth/sign-up').set('x-csrf-token', agent.csrf).send(input);
  if (res.status !== 202) throw new Error(`sign-up failed: ${res.status} ${JSON.stringify(res.body)}`);
  const token = await confirmationToken(t, input.email);
  await agent.token();
  const verified = await agent.post('/api/auth/verify-email').set('x-csrf-token', agent.csrf).send({ token });
  if (verified.status !== 200) throw new Error(`confirmation failed: ${verified.status} ${JSON.stringify(verified.body)}`);
  await agent.token();
  return verified.body.account as { id: string; email: string; emailVerified: boolean };
}
