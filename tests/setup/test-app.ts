import request from 'supertest';
import type { Express } from 'express';
import { loadConfig, type Config } from '../../server/config';
import { createApp } from '../../server/app';
import { createMailerFromConfig, createStripeFromConfig } from '../../server/deps';
import { createTestDatabase, type TestDatabase } from './test-db';
import { createMailFake } from '../../fakes/mail/server';
import { createMailSender, mailSenderOptionsFrom } from '../../server/jobs/mail-sender';
import pino from 'pino';

export type TestApp = {
  app: Express;
  config: Config;
  database: TestDatabase;
  mail: Awaited<ReturnType<typeof createMailFake>>;
  /** Sends what the mail queue holds now (what a worker does), through the SDK to the mail fake. */
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
  const build = () =>
    createApp({
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
    flushMail: () => sender.drain(),
    rebuild: build,
    close: async () => {
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
