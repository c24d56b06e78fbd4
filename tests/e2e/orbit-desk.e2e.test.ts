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
    await page.getByTestId('trend-chart').locator('canvas').first().waitFor();
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

  it('loads the trend of a large history and zooms on it', async () => {
    const { page, context, problems } = await newPage(browser);
    await signInAs(page, baseUrl, 'engineer@saltmarsh.example', DEMO_PASSWORD);
    // A comparison object with 20,000 sets, recorded and uploaded through the API as the desk does.
    const api = page.request;
    const csrf = (await (await api.get(`${baseUrl}/api/auth/csrf`)).json()).csrfToken as string;
    const craft = await api.post(`${baseUrl}/api/orbit/spacecraft`, {
      headers: { 'x-csrf-token': csrf },
      data: { name: 'Bulk reference', slug: 'bulk-ref', catalogNumber: '41010', massKg: 60, dragCoefficient: 2.2, dragAreaEdgeOnM2: 0.4 },
    });
    expect(craft.status()).toBe(201);
    const craftId = (await craft.json()).spacecraft.id as string;
    const many = simulateTern1({ days: 400 }).sets.filter((s) => !s.duplicate);
    const sets = Array.from({ length: 20_000 }, (_, i) => {
      const base = many[i % many.length]!;
      return {
        ...base,
        catalogNumber: '41010',
        catalogNumberInt: 41010,
        epochMs: Date.UTC(2021, 0, 1) + i * 3_600_000,
        elementSetNo: (i % 999) + 1,
      };
    });
    const up = await api.post(`${baseUrl}/api/orbit/spacecraft/${craftId}/uploads`, {
      headers: { 'x-csrf-token': csrf },
      multipart: { file: { name: 'bulk.tle', mimeType: 'text/plain', buffer: Buffer.from(formatTleFile(sets)) } },
    });
    expect(up.status()).toBe(202);
    const jobId = (await up.json()).upload.id as string;
    const waitFor = async (status: string) =>
      expect
        .poll(async () => (await (await api.get(`${baseUrl}/api/orbit/uploads/${jobId}`)).json()).upload.status, { timeout: 60_000 })
        .toBe(status);
    await waitFor('previewed');
    await api.post(`${baseUrl}/api/orbit/uploads/${jobId}/import`, { headers: { 'x-csrf-token': csrf }, data: {} });
    await waitFor('imported');

    await page.goto(`${baseUrl}/console/orbit`);
    await page.getByLabel('Spacecraft').selectOption({ label: 'Bulk reference' });
    const summary = page.getByTestId('trend-summary');
    await expect
      .poll(async () => summary.innerText(), { timeout: 30_000 })
      .toMatch(/: (19|20),\d{3} element sets in view, drawn as the lowest and highest value/);
    await page.getByTestId('sail-not-applicable').waitFor();
    await shot(page, 'orbit-09-large-history-desktop');
    // Drag across the middle of the plot: the view narrows and comes back at a finer resolution.
    const plot = page.getByTestId('trend-chart').locator('.u-over');
    const box = (await plot.boundingBox())!;
    await page.mouse.move(box.x + box.width * 0.4, box.y + box.height / 2);
    await page.mouse.down();
    await page.mouse.move(box.x + box.width * 0.45, box.y + box.height / 2, { steps: 5 });
    await page.mouse.up();
    await expect
      .poll(async () => summary.innerText(), { timeout: 30_000 })
      .toMatch(/^\d{4}-\d{2}-\d{2} to \d{4}-\d{2}-\d{2}: [\d,]+ element sets in view;/);
    const zoomed = Number((await summary.innerText()).match(/: ([\d,]+) element sets in view/)![1]!.replace(/,/g, ''));
    expect(zoomed).toBeGreaterThan(500);
    expect(zoomed).toBeLessThan(2_000);
    // The keyboard does the same: zoom out once, then back to the whole history.
    await page.getByTestId('trend-chart').focus();
    await page.keyboard.press('-');
    await page.keyboard.press('Home');
    await expect.poll(async () => summary.innerText(), { timeout: 30_000 }).toMatch(/: (19|20),\d{3} element sets in view, drawn/);
    await page.getByRole('button', { name: 'Zoom in' }).click();
    await expect
      .poll(async () => summary.innerText(), { timeout: 30_000 })
      .toMatch(/^[^:]+: (?!(19|20),\d{3} )[\d,]+ element sets in view/);
    await shot(page, 'orbit-10-large-history-zoomed-desktop');
    expect(problems).toEqual([]);
    await context.close();
  }, 180_000);

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
