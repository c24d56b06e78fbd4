import { afterAll, beforeAll, describe, expect, it, inject } from 'vitest';
import type { Browser } from 'playwright-core';
import { launchBrowser, newPage, shot, signInAs } from './browser';
import { DEMO_PASSWORD } from '../../server/demo/accounts';
import { formatTleFile } from '../../shared/orbit/tle-write';
import { simulateTern1, TERN1 } from '../../shared/orbit/simulate';

const baseUrl = inject('baseUrl');
let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => browser?.close());

// Six days past the seeded history, from the same simulation, plus one damaged line.
const fresh = simulateTern1({ days: TERN1.days + 6 }).sets.filter((s) => s.day >= TERN1.days && !s.duplicate);
const file = formatTleFile(fresh, { withNames: true }).trimEnd().split('\n');
const damagedLine = 5; // line 2 of the second set
file[damagedLine - 1] = file[damagedLine - 1]!.slice(0, 60) + 'xx' + file[damagedLine - 1]!.slice(62);
const fileText = file.join('\n') + '\n';

describe('the orbit desk in the browser', () => {
  it('uploads a file, previews it, imports, reads the chart and the rates, and saves a snapshot', async () => {
    const { page, context, problems } = await newPage(browser);
    await signInAs(page, baseUrl, 'engineer@saltmarsh.example', DEMO_PASSWORD);

    await page.goto(`${baseUrl}/console/orbit/upload`);
    await page.getByRole('heading', { name: 'Upload element sets' }).waitFor();
    await page
      .getByLabel('Element-set file')
      .setInputFiles({ name: 'tern-1-latest.tle', mimeType: 'text/plain', buffer: Buffer.from(fileText) });
    const preview = page.getByTestId('upload-preview');
    await preview.getByRole('heading', { name: 'Preview of tern-1-latest.tle' }).waitFor();
    const counts = preview.getByTestId('upload-counts');
    await expect.poll(async () => counts.innerText()).toMatch(new RegExp(`New\\s+${fresh.length - 1}\\b`, 'i'));
    expect(await counts.innerText()).toMatch(/Invalid\s+1\b/i);
    await expect.poll(async () => preview.getByRole('row').nth(1).innerText()).toMatch(new RegExp(`^${damagedLine}`));
    await shot(page, 'orbit-01-upload-preview-desktop');

    await preview.getByRole('button', { name: new RegExp(`^Import ${fresh.length - 1} new sets$`) }).click();
    await preview.getByRole('heading', { name: 'Imported' }).waitFor();
    expect(await preview.getByTestId('upload-message').innerText()).toBe(`Imported ${fresh.length - 1} element sets.`);
    await shot(page, 'orbit-02-imported-desktop');

    await preview.getByRole('link', { name: 'See the trend' }).click();
    await page.getByRole('heading', { name: 'Orbit trend' }).waitFor();
    await page.getByTestId('trend-chart').locator('.recharts-line-curve').first().waitFor();
    const rates = page.getByTestId('rates');
    await rates.waitFor();
    expect(await rates.innerText()).toMatch(/Apogee\s+[+-]\d+\.\d{3} km\/day/i);
    await page.getByTestId('sail-yield').getByText('not for collision or re-entry safety decisions').waitFor();
    await shot(page, 'orbit-03-trend-desktop');

    await page.getByLabel('Title').fill('Tern-1 after the latest upload');
    await page.getByLabel('Caption').fill('Apogee still rising while the sail is raising.');
    await page.getByRole('button', { name: 'Save snapshot' }).click();
    await page.getByText('Snapshot saved').waitFor();
    await page.getByRole('link', { name: /Open “Tern-1 after the latest upload”/ }).click();
    await page.getByRole('heading', { name: 'Tern-1 after the latest upload' }).waitFor();
    const apogee = page.locator('svg[role="img"] path[data-series="apogee"]');
    await apogee.first().waitFor();
    expect(await apogee.count()).toBe(1);
    await shot(page, 'orbit-04-snapshot-desktop');

    await page.goto(`${baseUrl}/console/orbit/history`);
    await page.getByRole('table', { name: 'Element-set history' }).waitFor();
    await shot(page, 'orbit-05-history-desktop');
    expect(problems).toEqual([]);
    await context.close();
  });

  it('fits a phone screen', async () => {
    const { page, context, problems } = await newPage(browser, { width: 390, height: 844 });
    await signInAs(page, baseUrl, 'engineer@saltmarsh.example', DEMO_PASSWORD);
    await page.goto(`${baseUrl}/console/orbit`);
    await page
      .getByTestId('rates')
      .waitFor()
      .catch(async (e) => {
        await shot(page, 'orbit-06-trend-phone-failed');
        throw e;
      });
    await shot(page, 'orbit-06-trend-phone');
    await page.goto(`${baseUrl}/console/orbit/upload`);
    await page.getByRole('heading', { name: 'Upload element sets' }).waitFor();
    await shot(page, 'orbit-07-upload-phone');
    await page.goto(`${baseUrl}/console/orbit/snapshots`);
    await page.getByTestId('snapshot-list').waitFor();
    await shot(page, 'orbit-08-snapshots-phone');
    const overflow = await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);
    expect(overflow).toBeLessThanOrEqual(0);
    expect(problems).toEqual([]);
    await context.close();
  });
});
