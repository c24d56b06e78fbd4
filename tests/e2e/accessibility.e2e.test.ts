// axe-core on every public page and each role's main console pages, at phone and desktop widths, in both themes
// (dark at 1280 px, light at 390 px): no serious or critical violation, a page title of its own and one level-1
// heading. Screenshots land in screenshots/a11y-*.png.
import { createRequire } from 'node:module';
import { afterAll, beforeAll, describe, expect, it, inject } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import { launchBrowser, shot, signInAs } from './browser';

const baseUrl = inject('baseUrl');
const axePath = createRequire(import.meta.url).resolve('axe-core/axe.min.js');
const password = 'tern-1-demo-pass';
let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => browser?.close());

type AxeResult = { violations: { id: string; impact: string | null; help: string; nodes: { target: string[] }[] }[] };

async function audit(page: Page) {
  await page.addScriptTag({ path: axePath });
  const result = await page.evaluate(async () => {
    const axe = (window as unknown as { axe: { run: (ctx: Document, opts: object) => Promise<AxeResult> } }).axe;
    return axe.run(document, { resultTypes: ['violations'] });
  });
  return result.violations
    .filter((v) => v.impact === 'serious' || v.impact === 'critical')
    .map((v) => `${v.impact} ${v.id}: ${v.help} — ${v.nodes.map((n) => n.target.join(' ')).join(', ')}`);
}

const views = [
  { width: 1280, height: 860, theme: 'dark' as const },
  { width: 390, height: 844, theme: 'light' as const },
];

async function check(path: string, name: string, account?: string, heading?: RegExp) {
  for (const view of views) {
    const context = await browser.newContext({
      viewport: { width: view.width, height: view.height },
      bypassCSP: true,
      colorScheme: view.theme,
    });
    const page = await context.newPage();
    const errors: string[] = [];
    page.on('pageerror', (e) => errors.push(e.message));
    if (account) await signInAs(page, baseUrl, account, password);
    await page.goto(`${baseUrl}${path}`, { waitUntil: 'networkidle' });
    const h1 = page.getByRole('heading', { level: 1 });
    await h1.first().waitFor();
    if (heading) await expect.poll(() => h1.first().textContent()).toMatch(heading);
    // Loading states have settled: no spinner left announcing itself.
    await expect
      .poll(
        () =>
          page
            .getByRole('status')
            .filter({ hasText: /loading/i })
            .count(),
        { timeout: 20_000 },
      )
      .toBe(0);
    expect(await page.title(), `${path} has a title of its own`).toMatch(/^(?!Lightkeel$).+ · Lightkeel$/);
    expect(await h1.count(), `${path} has one level-1 heading`).toBe(1);
    await shot(page, `a11y-${name}-${view.width}-${view.theme}`);
    expect(await audit(page), `${path} at ${view.width} px, ${view.theme}`).toEqual([]);
    expect(errors).toEqual([]);
    await context.close();
  }
}

describe('public pages pass axe with no serious or critical violation', () => {
  const pages: [string, string, RegExp?][] = [
    ['/', 'mission'],
    ['/campaign', 'campaign'],
    ['/campaign/pledge', 'pledge'],
    ['/dispatches', 'dispatches'],
    ['/where-it-is-now', 'where-it-is-now'],
    ['/sky-watch', 'sky-watch'],
    ['/sign-in', 'sign-in'],
    ['/sign-up', 'sign-up'],
    ['/forgot-password', 'forgot-password'],
    ['/campaign/no-such-campaign', 'campaign-missing', /no campaign/i],
    ['/no-such-page', 'not-found', /no page/i],
  ];
  for (const [path, name, heading] of pages) it(`${path}`, async () => check(path, name, undefined, heading), 120_000);
});

describe('main console pages pass axe with no serious or critical violation', () => {
  const pages: [string, string, string][] = [
    ['/my-support', 'my-support', 'backer@saltmarsh.example'],
    ['/my-support/pledges', 'my-support-pledges', 'backer@saltmarsh.example'],
    ['/console/orbit', 'orbit-desk-trend', 'engineer@saltmarsh.example'],
    ['/console/campaign', 'campaign-desk', 'outreach@saltmarsh.example'],
    ['/console/dispatches', 'dispatch-desk', 'outreach@saltmarsh.example'],
    ['/console/books', 'books', 'finance@saltmarsh.example'],
    ['/console/books/reconcile', 'books-reconcile', 'finance@saltmarsh.example'],
    ['/console/books/pledges', 'books-pledges', 'finance@saltmarsh.example'],
    ['/console/books/months', 'books-months', 'finance@saltmarsh.example'],
    ['/console/people', 'people', 'admin@saltmarsh.example'],
  ];
  for (const [path, name, account] of pages) it(`${path} as ${account.split('@')[0]}`, async () => check(path, name, account), 180_000);
});

describe('error pages say what happened and what to do', () => {
  it('a campaign that does not exist is named, and no "Try again" is offered', async () => {
    const context = await browser.newContext({ viewport: { width: 390, height: 844 } });
    const page = await context.newPage();
    await page.goto(`${baseUrl}/campaign/xyz`, { waitUntil: 'networkidle' });
    await expect.poll(() => page.getByRole('heading', { level: 1 }).textContent()).toBe('There is no campaign “xyz”');
    expect(await page.getByRole('button', { name: /try again/i }).count()).toBe(0);
    expect(await page.getByRole('link', { name: /see the current campaign/i }).getAttribute('href')).toBe('/campaign');
    await context.close();
  });
});
