import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { createTestApp, type TestApp } from '../setup/test-app';

// The session cookie's Secure flag follows PUBLIC_URL, never whether a proxy header arrived.
let httpsApp: TestApp;
let httpsBehindProxy: TestApp;
let httpApp: TestApp;

beforeAll(async () => {
  httpsApp = await createTestApp({ PUBLIC_URL: 'https://mission.saltmarsh.example' });
  httpsBehindProxy = await createTestApp({ PUBLIC_URL: 'https://mission.saltmarsh.example', TRUST_PROXY: 'true' });
  httpApp = await createTestApp({ PUBLIC_URL: 'http://127.0.0.1:3999' });
});
afterAll(async () => {
  await httpsApp.close();
  await httpsBehindProxy.close();
  await httpApp.close();
});

function sessionCookie(res: request.Response) {
  const cookies = ([] as string[]).concat(res.headers['set-cookie'] ?? []);
  return cookies.find((c) => c.startsWith('lk.sid='));
}

describe('session cookie Secure flag', () => {
  it('is Secure with an https PUBLIC_URL even when the request arrives over plain HTTP', async () => {
    const res = await request(httpsApp.app).get('/api/auth/csrf').expect(200);
    const cookie = sessionCookie(res);
    expect(cookie).toBeDefined();
    expect(cookie).toMatch(/;\s*Secure/i);
    expect(cookie).toMatch(/HttpOnly/i);
  });

  it('is Secure behind a trusted proxy whatever X-Forwarded-Proto says', async () => {
    for (const proto of ['http', 'https', undefined]) {
      const req = request(httpsBehindProxy.app).get('/api/auth/csrf');
      if (proto) req.set('X-Forwarded-Proto', proto);
      const cookie = sessionCookie(await req.expect(200));
      expect(cookie, `X-Forwarded-Proto: ${proto}`).toMatch(/;\s*Secure/i);
    }
  });

  it('is not Secure with an http PUBLIC_URL (local loopback set-up)', async () => {
    const cookie = sessionCookie(await request(httpApp.app).get('/api/auth/csrf').expect(200));
    expect(cookie).toBeDefined();
    expect(cookie).not.toMatch(/Secure/i);
  });
});
