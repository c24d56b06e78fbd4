// A database outage, a locked table and a session store that is down answer 503 with Retry-After (and an
// error id the log holds), never 500; a value PostgreSQL refuses answers 400.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import express from 'express';
import pino from 'pino';
import pg from 'pg';
import { Writable } from 'node:stream';
import { createApp } from '../../server/app';
import { createDb } from '../../server/db/client';
import { loadConfig } from '../../server/config';
import { createStripeFromConfig } from '../../server/deps';
import { errorHandler } from '../../server/middleware/error-handler';
import { createTestApp, agentFor, signIn, type TestApp } from '../setup/test-app';
import { freePort } from '../setup/global-setup';
import { seedDemoAccounts, DEMO_PASSWORD } from '../../server/demo/accounts';
import { insertCampaign } from './pledges-fixtures';

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp({ SIGN_IN_LIMIT_PER_IP: '1000' });
  await seedDemoAccounts(t.database.db);
  await insertCampaign(t);
});
afterAll(async () => t.close());

/** A logger whose lines the test can read. */
function capturedLogger() {
  const lines: Record<string, unknown>[] = [];
  const stream = new Writable({
    write(chunk, _enc, done) {
      for (const line of String(chunk).split('\n').filter(Boolean)) lines.push(JSON.parse(line));
      done();
    },
  });
  return { logger: pino({ level: 'warn' }, stream), lines };
}

function appOn(pool: pg.Pool, db: ReturnType<typeof createDb>['db'], logger?: pino.Logger) {
  return createApp({
    db,
    pool,
    config: t.config,
    logger,
    mailer: { send: async () => ({ id: 'x' }) },
    stripe: createStripeFromConfig(t.config),
  });
}

describe('database outage', () => {
  it('answers data routes with 503, Retry-After and an error id that the log holds', async () => {
    // A port nothing listens on: the database is down.
    const { db, pool } = createDb(`postgres://postgres@127.0.0.1:${await freePort()}/gone`, { connectTimeoutMs: 500 });
    const { logger, lines } = capturedLogger();
    const app = appOn(pool, db, logger);
    for (const path of ['/api/campaigns', '/api/campaigns/tern-1', '/api/public/orbit/tern-1']) {
      const res = await request(app).get(path).timeout(10_000);
      expect(res.status, `${path}: ${JSON.stringify(res.body)}`).toBe(503);
      expect(Number(res.headers['retry-after'])).toBeGreaterThan(0);
      expect(res.body.error.code).toBe('service_unavailable');
      expect(res.body.error.errorId).toMatch(/^[0-9a-f-]{36}$/);
      expect(lines.some((l) => l.errorId === res.body.error.errorId && (l.level as number) >= 50)).toBe(true);
    }
    await pool.end();
  });

  it('hands out no CSRF token while the session store is down', async () => {
    const { db, pool } = createDb(`postgres://postgres@127.0.0.1:${await freePort()}/gone`, { connectTimeoutMs: 500 });
    const app = appOn(pool, db);
    const res = await request(app).get('/api/auth/csrf').timeout(10_000);
    expect(res.status, JSON.stringify(res.body)).toBe(503);
    expect(res.body.csrfToken).toBeUndefined();
    expect(Number(res.headers['retry-after'])).toBeGreaterThan(0);
    await pool.end();
  });

  it('stores the session before answering with a CSRF token, so the token works on the next request', async () => {
    const agent = agentFor(t.app);
    const res = await agent.get('/api/auth/csrf').expect(200);
    const sid = /lk\.sid=s%3A([^.;]+)/.exec(String(res.headers['set-cookie']))?.[1];
    const { rows } = await t.database.pool.query('select sess from session where sid = $1', [sid]);
    expect(rows[0]?.sess?.csrfToken).toBe(res.body.csrfToken);
  });

  it('turns a statement stuck behind a locked table into a quick 503, and changes nothing', async () => {
    const { db, pool } = createDb(t.database.url, { statementTimeoutMs: 300 });
    const app = appOn(pool, db);
    const outreach = agentFor(app);
    await signIn(outreach, 'outreach@saltmarsh.example', DEMO_PASSWORD);
    const locker = new pg.Client({ connectionString: t.database.url });
    await locker.connect();
    try {
      await locker.query('begin');
      await locker.query('lock table campaigns in access exclusive mode');
      const started = Date.now();
      const read = await outreach.get('/api/campaigns').timeout(8_000);
      expect(read.status, JSON.stringify(read.body)).toBe(503);
      expect(Number(read.headers['retry-after'])).toBeGreaterThan(0);
      const write = await outreach.patch('/api/campaigns/tern-1').set('x-csrf-token', outreach.csrf).timeout(8_000).send({
        title: 'Renamed while locked',
        goalMinor: 4_800_000,
        currency: 'USD',
        startsAt: '2026-01-01T00:00:00Z',
        endsAt: '2026-12-01T00:00:00Z',
      });
      expect(write.status, JSON.stringify(write.body)).toBe(503);
      // Two statements of 0.3 s each, not the lock's whole life.
      expect(Date.now() - started).toBeLessThan(5_000);
    } finally {
      await locker.query('rollback');
      await locker.end();
    }
    const { rows } = await t.database.pool.query(`select title from campaigns where slug = 'tern-1'`);
    expect(rows[0].title).toBe('Tern-1 sail test campaign');
    await pool.end();
  });

  it('reads both timeouts from the environment', () => {
    const config = loadConfig({ DATABASE_CONNECT_TIMEOUT_MS: '1500', DATABASE_STATEMENT_TIMEOUT_MS: '2500' });
    expect(config.DATABASE_CONNECT_TIMEOUT_MS).toBe(1500);
    expect(config.DATABASE_STATEMENT_TIMEOUT_MS).toBe(2500);
    expect(loadConfig({}).DATABASE_STATEMENT_TIMEOUT_MS).toBeGreaterThan(0);
    expect(() => loadConfig({ DATABASE_STATEMENT_TIMEOUT_MS: 'soon' })).toThrow(/DATABASE_STATEMENT_TIMEOUT_MS/);
  });
});

describe('values the database refuses', () => {
  it('answer 400, never 500 (SQLSTATE class 22)', async () => {
    const app = express();
    app.get('/nul', async (_req, res) => {
      await t.database.pool.query('select $1::text as v', ['a\u0000b']);
      res.end();
    });
    app.get('/divide', async (_req, res) => {
      await t.database.pool.query('select 1 / 0');
      res.end();
    });
    app.get('/surrogate', async (_req, res) => {
      await t.database.pool.query(`select '"\\ud800"'::jsonb`);
      res.end();
    });
    app.use(errorHandler);
    for (const path of ['/nul', '/divide', '/surrogate']) {
      const res = await request(app).get(path);
      expect(res.status, `${path}: ${JSON.stringify(res.body)}`).toBe(400);
      expect(res.body.error.code).toBe('request.bad_value');
    }
  });
});
