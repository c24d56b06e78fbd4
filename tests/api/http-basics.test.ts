import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import pg from 'pg';
import { drizzle } from 'drizzle-orm/node-postgres';
import * as schema from '../../server/db/schema';
import { createApp } from '../../server/app';
import { createTestApp, agentFor, type TestApp } from '../setup/test-app';
import { loadConfig, ConfigError } from '../../server/config';
import { createStripeFromConfig } from '../../server/deps';
import express from 'express';
import { errorHandler } from '../../server/middleware/error-handler';

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp({ JSON_BODY_LIMIT: '2kb' });
});
afterAll(async () => t.close());

describe('HTTP basics', () => {
  it('reports health ok when the database answers', async () => {
    const res = await request(t.app).get('/api/health').expect(200);
    expect(res.body).toEqual({ status: 'ok', db: 'ok' });
  });

  it('reports 503 when the database does not answer', async () => {
    const pool = new pg.Pool({ connectionString: 'postgres://postgres@127.0.0.1:1/none', connectionTimeoutMillis: 500 });
    const app = createApp({
      db: drizzle(pool, { schema }),
      pool,
      config: t.config,
      mailer: { send: async () => ({ id: 'x' }) },
      stripe: createStripeFromConfig(t.config),
    });
    const res = await request(app).get('/api/health');
    expect(res.status).toBe(503);
    expect(res.body.db).toBe('unreachable');
    await pool.end();
  });

  it('answers bad JSON with 400, an oversized body with 413 and an unknown API route with a JSON 404', async () => {
    const agent = agentFor(t.app);
    await agent.token();
    const bad = await agent
      .post('/api/auth/sign-in')
      .set('x-csrf-token', agent.csrf)
      .set('content-type', 'application/json')
      .send('{"email": ');
    expect(bad.status).toBe(400);
    expect(bad.body.error.code).toBe('request.bad_json');
    const big = await agent
      .post('/api/auth/sign-in')
      .set('x-csrf-token', agent.csrf)
      .send({ email: 'a@b.cd', password: 'x'.repeat(5000) });
    expect(big.status).toBe(413);
    const missing = await request(t.app).get('/api/no-such-thing').expect(404);
    expect(missing.body.error.code).toBe('not_found');
  });

  it('answers invalid fields with 400 and the path of each field', async () => {
    const agent = agentFor(t.app);
    await agent.token();
    const res = await agent.post('/api/auth/sign-up').set('x-csrf-token', agent.csrf).send({ email: 'not-an-email', password: 'short' });
    expect(res.status).toBe(400);
    const paths = res.body.error.details.map((d: { path: string }) => d.path).sort();
    expect(paths).toEqual(['body.displayName', 'body.email', 'body.password']);
  });

  it('stops start-up with a message naming an invalid variable', () => {
    expect(() => loadConfig({ PORT: 'seventy' })).toThrow(ConfigError);
    expect(() => loadConfig({ DATABASE_URL: 'mysql://x' })).toThrow(/DATABASE_URL/);
  });

  it('sends security headers and no stack traces', async () => {
    const res = await request(t.app).get('/api/health');
    expect(res.headers['x-content-type-options']).toBe('nosniff');
    expect(res.headers['x-powered-by']).toBeUndefined();
  });

  it('answers an unexpected failure with 500 and an error id, never the stack', async () => {
    const app = express();
    const logged: unknown[] = [];
    app.use((req, _res, next) => {
      (req as unknown as { log: { error: (o: unknown) => void } }).log = { error: (o) => logged.push(o) };
      next();
    });
    app.get('/boom', () => {
      throw new Error('secret internal detail');
    });
    app.use(errorHandler);
    const res = await request(app).get('/boom').expect(500);
    expect(res.body.error.code).toBe('internal');
    expect(res.body.error.errorId).toMatch(/^[0-9a-f-]{36}$/);
    expect(JSON.stringify(res.body)).not.toContain('secret internal detail');
    expect((logged[0] as { errorId: string }).errorId).toBe(res.body.error.errorId);
  });
});
