import { afterAll, beforeAll, describe, expect, it, inject } from 'vitest';
import type { Browser } from 'playwright-core';
import { launchBrowser, newPage, shot } from './browser';

const baseUrl = inject('baseUrl');
let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => browser?.close());

// A signed-out visitor's browser console stays clean: no error line at all, and that includes the
// "Failed to load resource: … 401" line a browser prints for any failing request (which newPage() forgives).
describe('signed-out pages', () => {
  for (const path of ['/', '/campaign', '/sign-in']) {
    it(`${path} logs no console error and makes no failing request`, async () => {
      const context = await browser.newContext({ viewport: { width: 1280, height: 860 } });
      const page = await context.newPage();
      const problems: string[] = [];
      page.on('console', (m) => {
        if (m.type() === 'error') problems.push(`console: ${m.text()}`);
      });
      page.on('pageerror', (e) => problems.push(`pageerror: ${e.message}`));
      page.on('response', (r) => {
        if (r.status() >= 400) problems.push(`${r.status()} ${r.request().method()} ${new URL(r.url()).pathname}`);
      });
      await page.goto(`${baseUrl}${path}`, { waitUntil: 'networkidle' });
      await page.getByRole('heading', { level: 1 }).first().waitFor();
      await shot(page, `signed-out${path === '/' ? '-home' : path.replace(/\//g, '-')}`);
      expect(problems).toEqual([]);
      await context.close();
    });
  }
});

describe('a Google callback link from another browser', () => {
  it('signs nobody in and says why on the sign-in page', async () => {
    // Another browser starts "Continue with Google" and stops at the provider's redirect back.
    const start = await fetch(`${baseUrl}/api/auth/google?returnTo=%2Fmy-support`, { redirect: 'manual' });
    const authorize = await fetch(start.headers.get('location')!, { redirect: 'manual' });
    const callbackUrl = authorize.headers.get('location') ?? '';
    expect(callbackUrl).toMatch(/\/api\/auth\/google\/callback\?.*code=/);

    // Browser B is sent that link.
    const { page, context, problems } = await newPage(browser);
    await page.goto(callbackUrl);
    await page.waitForURL((u) => u.pathname === '/sign-in');
    await expect.poll(() => page.getByRole('alert').textContent()).toMatch(/not signed in.*not started from this browser/is);
    await expect
      .poll(() =>
        page
          .getByRole('link', { name: /sign in/i })
          .first()
          .isVisible(),
      )
      .toBe(true);
    await shot(page, 'google-callback-from-another-browser');
    const me = await page.evaluate(async () => (await fetch('/api/auth/me')).json());
    expect(me).toEqual({ account: null });
    expect(problems).toEqual([]);
    await context.close();
  });
});
