import { afterAll, beforeAll, describe, expect, it, inject } from 'vitest';
import type { Browser } from 'playwright-core';
import { launchBrowser, newPage, shot, signInAs } from './browser';
import { DEMO_PASSWORD } from '../../server/demo/accounts';

const baseUrl = inject('baseUrl');
let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => browser?.close());

describe('the mail queue page', () => {
  it('shows a password-reset message sent by the worker, with the service answer, on a desk and on a phone', async () => {
    // Ask for a reset signed out: the route enqueues, the worker (beside the app) queues and sends the mail.
    const { page, context, problems } = await newPage(browser);
    await page.goto(`${baseUrl}/forgot-password`);
    await page.getByLabel(/^e-?mail( address)?$/i).fill('engineer@saltmarsh.example');
    await Promise.all([
      page.waitForResponse((r) => r.url().includes('/api/auth/request-password-reset') && r.status() === 202),
      page.getByRole('button', { name: /reset|send/i }).click(),
    ]);
    await signInAs(page, baseUrl, 'admin@saltmarsh.example', DEMO_PASSWORD);
    await page.goto(`${baseUrl}/console/people/mail-queue`);
    await page.getByRole('heading', { name: 'Mail queue', level: 1 }).waitFor();
    const row = page.getByRole('row').filter({ hasText: 'engineer@saltmarsh.example' }).filter({ hasText: 'password-reset' });
    await expect.poll(async () => (await row.count()) > 0 && /Sent/.test(await row.first().innerText()), { timeout: 20_000 }).toBe(true);
    expect(await row.first().innerText()).toMatch(/Accepted as [0-9a-f-]{36}/);
    await shot(page, 'mail-queue-desk');
    await page.setViewportSize({ width: 390, height: 844 });
    await shot(page, 'mail-queue-phone');
    expect(problems).toEqual([]);
    await context.close();
  });
});
