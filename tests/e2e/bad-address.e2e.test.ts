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

describe('mistyped addresses and refused forms speak in words', () => {
  it('a mistyped snapshot id gives the console’s own not-found page with a way back', async () => {
    const { page, context, problems } = await newPage(browser);
    await signInAs(page, baseUrl, 'engineer@saltmarsh.example', DEMO_PASSWORD);
    await page.goto(`${baseUrl}/console/orbit/snapshots/not-an-id`);
    await page.getByRole('heading', { name: 'No page at this address' }).waitFor();
    expect(await page.getByText(/must be an id|params\./).count()).toBe(0);
    expect(await page.getByRole('link', { name: 'Back to the console' }).count()).toBe(1);
    await shot(page, 'bad-address-snapshot');
    expect(problems).toEqual([]);
    await context.close();
  });

  it('a mistyped receipt number gives my support’s not-found page', async () => {
    const { page, context, problems } = await newPage(browser);
    await signInAs(page, baseUrl, 'backer@saltmarsh.example', DEMO_PASSWORD);
    await page.goto(`${baseUrl}/my-support/receipts/abc`);
    await page.getByRole('heading', { name: 'No page at this address' }).waitFor();
    expect(await page.getByRole('link', { name: 'Back to my support' }).count()).toBe(1);
    expect(problems).toEqual([]);
    await context.close();
  });

  it('puts the server’s answer by the field it is about, without the field’s code name', async () => {
    const { page, context, problems } = await newPage(browser);
    await signInAs(page, baseUrl, 'backer@saltmarsh.example', DEMO_PASSWORD);
    await page.goto(`${baseUrl}/my-support/data`);
    await page.getByRole('button', { name: 'Delete my account…' }).click();
    await page.getByLabel('Your e-mail address').fill('someone-else@saltmarsh.example');
    await page.getByRole('dialog').getByRole('button', { name: 'Delete my account' }).click();
    const field = page.getByLabel('Your e-mail address');
    await expect.poll(() => field.getAttribute('aria-invalid')).toBe('true');
    await page.getByText('does not match your e-mail address').waitFor();
    expect(await page.getByText(/confirmEmail/).count()).toBe(0);
    await shot(page, 'delete-account-mismatch');
    expect(problems).toEqual([]);
    await context.close();
  });
});
