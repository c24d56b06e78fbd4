// The mission page arrives rendered by the server (issue 12 §6): it reads without scripts, hydrates without a
// mismatch or any console complaint, fetches the code of its lower sections only when the visitor scrolls to them,
// and after that behaves as the app (client-side links, theme toggle). Screenshots: screenshots/mission-*.png.
import { afterAll, beforeAll, describe, expect, it, inject } from 'vitest';
import type { Browser, BrowserContext, Page } from 'playwright-core';
import { launchBrowser, shot } from './browser';

const baseUrl = inject('baseUrl');
let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => browser?.close());

/** Every console error or warning and uncaught error of the page (React reports hydration mismatches there). */
function watch(page: Page) {
  const problems: string[] = [];
  page.on('console', (m) => {
    if (m.type() === 'error' || m.type() === 'warning') problems.push(`${m.type()}: ${m.text()}`);
  });
  page.on('pageerror', (e) => problems.push(`pageerror: ${e.message}`));
  const scripts: string[] = [];
  const apiCalls: string[] = [];
  page.on('response', (r) => {
    if (r.request().resourceType() === 'script') scripts.push(new URL(r.url()).pathname);
    if (new URL(r.url()).pathname.startsWith('/api/')) apiCalls.push(new URL(r.url()).pathname);
  });
  return { problems, scripts, apiCalls };
}

/** True once React has hydrated the element (it keeps its fiber on the DOM node). */
const hydrated = (page: Page, id: string) =>
  page.evaluate((elementId) => {
    const el = document.getElementById(elementId);
    return el !== null && Object.keys(el).some((k) => k.startsWith('__reactFiber'));
  }, id);

describe('the mission page from the server', () => {
  it('sends the whole page as HTML with its data, and no inline script', async () => {
    const res = await fetch(`${baseUrl}/`);
    const html = await res.text();
    expect(res.status).toBe(200);
    const root = html.slice(html.indexOf('<div id="root">'), html.indexOf('<script type="application/json"'));
    expect(root).toContain('A sail the size of a small flat, pushed by sunlight.');
    expect(root).toContain('Flight budget');
    expect(root).toContain('Orbit status');
    // The demo's published dispatches (server/demo/dispatch-seed.ts), newest first.
    expect(root.indexOf('A year of sailing')).toBeGreaterThan(0);
    expect(root.indexOf('The sail is open')).toBeGreaterThan(root.indexOf('A year of sailing'));
    expect(root).not.toContain('No dispatches published yet');
    expect(root).not.toContain('<script');
    const data = JSON.parse(html.match(/<script type="application\/json" id="lk-ssr-data">([^<]*)<\/script>/)![1]!) as {
      key: string[];
      data: unknown;
      updatedAt: number;
    }[];
    expect(data.map((q) => q.key.join('/')).sort()).toEqual([
      'auth/me',
      'campaigns/detail/tern-1',
      'dispatches/feed',
      'live-orbit/summary',
    ]);
    // Rendered for a visitor who is signed out, and it says so: the browser does not ask again, and the header is
    // not drawn a second time when the answer comes.
    expect(data.find((q) => q.key.join('/') === 'auth/me')?.data).toBeNull();
    expect(res.headers.get('cache-control')).toBe('no-cache');
    // Fonts of the first screen are fetched with the stylesheet.
    expect(html).toMatch(
      /<link rel="preload" href="\/assets\/nunito-sans-latin-700-normal-[\w-]+\.woff2" as="font" type="font\/woff2" crossorigin/,
    );
    expect(Math.abs(Date.now() - data[0]!.updatedAt)).toBeLessThan(120_000);
    // Titles and Open Graph tags still come from server/lib/page-meta.ts.
    expect(html).toMatch(/<title>Tern-1 — a solar sail from the Saltmarsh Orbital Society · Lightkeel<\/title>/);
    expect(html).toContain('<meta property="og:image"');
  });

  it('reads without JavaScript', async () => {
    const context = await browser.newContext({ viewport: { width: 390, height: 844 }, javaScriptEnabled: false });
    const page = await context.newPage();
    await page.goto(`${baseUrl}/`);
    await expect(page.getByRole('heading', { level: 1 }).textContent()).resolves.toMatch(/pushed by sunlight/);
    await expect(page.getByRole('heading', { name: 'Orbit status' }).isVisible()).resolves.toBe(true);
    await expect(page.getByRole('link', { name: 'The sail is open' }).getAttribute('href')).resolves.toBe('/dispatches/the-sail-is-open');
    await context.close();
  });
});

describe('hydration', () => {
  let context: BrowserContext;
  afterAll(async () => context?.close());

  it('on a phone: the first screen hydrates, the sections below load and hydrate on scroll, the console stays clean', async () => {
    context = await browser.newContext({ viewport: { width: 390, height: 844 } });
    const page = await context.newPage();
    const { problems, scripts, apiCalls } = watch(page);
    await page.goto(`${baseUrl}/`, { waitUntil: 'networkidle' });
    await expect.poll(() => hydrated(page, 'hero-title')).toBe(true);
    expect(await hydrated(page, 'mission-sections')).toBe(false);
    // Everything the first screen shows came with the page, who is signed in included.
    expect(apiCalls).toEqual([]);
    expect(scripts.some((s) => s.includes('home-sections'))).toBe(false);
    await shot(page, 'mission-390-first-screen');

    await page.getByRole('heading', { name: 'Flight budget' }).scrollIntoViewIfNeeded();
    await expect.poll(() => hydrated(page, 'mission-sections'), { timeout: 15_000 }).toBe(true);
    expect(scripts.some((s) => s.includes('home-sections'))).toBe(true);

    // Hydrated links navigate inside the app: the page (and this marker) survives the move.
    await page.evaluate(() => ((window as unknown as { __stay: number }).__stay = 1));
    await page.getByRole('link', { name: 'All dispatches' }).click();
    await page.waitForURL(`${baseUrl}/dispatches`);
    await page.getByRole('heading', { level: 1 }).first().waitFor();
    expect(await page.evaluate(() => (window as unknown as { __stay?: number }).__stay)).toBe(1);
    expect(problems).toEqual([]);
  });

  it('on a phone: leaving before scrolling down and coming back shows the sections at once, and they hydrate when near', async () => {
    const phone = await browser.newContext({ viewport: { width: 390, height: 844 } });
    const page = await phone.newPage();
    const { problems } = watch(page);
    await page.goto(`${baseUrl}/`, { waitUntil: 'networkidle' });
    await expect.poll(() => hydrated(page, 'hero-title')).toBe(true);
    await page.getByRole('button', { name: 'Menu' }).click();
    await page.getByRole('navigation', { name: 'Site (menu)' }).getByRole('link', { name: 'Dispatches' }).click();
    await page.waitForURL(`${baseUrl}/dispatches`);
    await page.getByRole('heading', { level: 1 }).first().waitFor();
    await page.goBack();
    // Back on the page (restored from the browser's back-forward cache, or rendered again by the app), the sections
    // are there at once, and they hydrate as soon as the visitor comes near them.
    const budget = page.getByRole('heading', { name: 'Flight budget' });
    await budget.waitFor();
    await budget.scrollIntoViewIfNeeded();
    await expect.poll(() => hydrated(page, 'mission-sections'), { timeout: 15_000 }).toBe(true);
    expect(problems).toEqual([]);
    await phone.close();
  });

  it('on a desktop in the light theme: the toggle works after hydration and nothing mismatches', async () => {
    const desk = await browser.newContext({ viewport: { width: 1280, height: 860 }, colorScheme: 'light' });
    const page = await desk.newPage();
    const { problems } = watch(page);
    await page.goto(`${baseUrl}/`, { waitUntil: 'networkidle' });
    await expect.poll(() => hydrated(page, 'mission-sections'), { timeout: 15_000 }).toBe(true);
    // The server cannot know the theme; after hydration the toggle names the visitor's own.
    const toggle = page.getByRole('button', { name: /light theme on/i }).first();
    await toggle.waitFor();
    await toggle.click();
    await expect.poll(() => page.evaluate(() => document.documentElement.dataset.theme)).toBe('dark');
    await page
      .getByRole('button', { name: /dark theme on/i })
      .first()
      .waitFor();
    await page.mouse.wheel(0, 4000);
    await page.waitForTimeout(300);
    await shot(page, 'mission-1280-dark-after-toggle');
    expect(problems).toEqual([]);
    await desk.close();
  });
});
