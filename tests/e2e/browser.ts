import { chromium, type Browser, type Page } from 'playwright-core';
import { mkdirSync } from 'node:fs';
import path from 'node:path';

export const screenshotDir = path.resolve('screenshots');

// Debian's chromium, flags that keep it off the closed network (see ../shared/STACK.md).
export async function launchBrowser(): Promise<Browser> {
  mkdirSync(screenshotDir, { recursive: true });
  return chromium.launch({
    executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
    headless: true,
    args: [
      '--no-sandbox',
      '--disable-gpu',
      '--disable-quic',
      '--no-first-run',
      '--disable-background-networking',
      '--disable-component-update',
      '--disable-sync',
      '--disable-dev-shm-usage',
    ],
  });
}

/** A page that fails the test on any console error or uncaught page error. */
export async function newPage(browser: Browser, opts: { width?: number; height?: number } = {}) {
  const context = await browser.newContext({ viewport: { width: opts.width ?? 1280, height: opts.height ?? 860 } });
  const page = await context.newPage();
  const problems: string[] = [];
  page.on('pageerror', (e) => problems.push(`pageerror: ${e.message}`));
  page.on('console', (m) => {
    if (m.type() === 'error' && !/Failed to load resource: the server responded with a status of 4\d\d/.test(m.text()))
      problems.push(`console: ${m.text()}`);
  });
  return { page, context, problems };
}

export async function shot(page: Page, name: string) {
  await page.screenshot({ path: path.join(screenshotDir, `${name}.png`), fullPage: true });
}

export async function signInAs(page: Page, baseUrl: string, email: string, password: string) {
  await page.goto(`${baseUrl}/sign-in`);
  await page.getByLabel(/^e-?mail( address)?$/i).fill(email);
  await page.getByLabel(/^password$/i).fill(password);
  await page.getByRole('button', { name: /^sign in$/i }).click();
  await page.waitForURL((u) => !u.pathname.startsWith('/sign-in'));
}
