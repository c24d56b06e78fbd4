import { afterAll, beforeAll, describe, expect, it, inject } from 'vitest';
import type { Browser, Locator } from 'playwright-core';
import { launchBrowser, newPage, shot, signInAs } from './browser';
import { DEMO_PASSWORD } from '../../server/demo/accounts';
import { formatTleFile } from '../../shared/orbit/tle-write';
import { simulateTern1 } from '../../shared/orbit/simulate';

const baseUrl = inject('baseUrl');
let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => browser?.close());

/** aria-valuenow / aria-valuemax of the card's progress bar named `name`, read in one go (null while it is not shown). */
function reading(card: Locator, name: string) {
  return card.evaluate((el, label) => {
    const bar = el.querySelector(`[role="progressbar"][aria-label="${label}"]`);
    return bar ? { now: Number(bar.getAttribute('aria-valuenow')), max: Number(bar.getAttribute('aria-valuemax')) } : null;
  }, name);
}

describe('a large upload in the browser', () => {
  it('shows the worker checking and importing the file with a progress bar, then the result', async () => {
    const { page, context, problems } = await newPage(browser);
    await signInAs(page, baseUrl, 'engineer@saltmarsh.example', DEMO_PASSWORD);
    const api = page.request;
    const csrf = (await (await api.get(`${baseUrl}/api/auth/csrf`)).json()).csrfToken as string;
    const craft = await api.post(`${baseUrl}/api/orbit/spacecraft`, {
      headers: { 'x-csrf-token': csrf },
      data: {
        name: 'Progress reference',
        slug: 'progress-ref',
        catalogNumber: '41020',
        massKg: 60,
        dragCoefficient: 2.2,
        dragAreaEdgeOnM2: 0.4,
      },
    });
    expect(craft.status()).toBe(201);
    const N = 60_000;
    const base = simulateTern1({ days: 200 }).sets.filter((s) => !s.duplicate);
    const sets = Array.from({ length: N }, (_, i) => ({
      ...base[i % base.length]!,
      catalogNumber: '41020',
      catalogNumberInt: 41020,
      epochMs: Date.UTC(2019, 0, 1) + i * 1_800_000,
      elementSetNo: (i % 999) + 1,
    }));

    await page.goto(`${baseUrl}/console/orbit/upload`);
    await page.getByRole('heading', { name: 'Upload element sets' }).waitFor();
    await page.getByLabel('Spacecraft').selectOption({ label: 'Progress reference' });
    await page
      .getByLabel('Element-set file')
      .setInputFiles({ name: 'progress-ref.tle', mimeType: 'text/plain', buffer: Buffer.from(formatTleFile(sets)) });
    const preview = page.getByTestId('upload-preview');
    await preview.getByRole('heading', { name: 'Preview of progress-ref.tle' }).waitFor();
    await expect.poll(async () => preview.getByTestId('upload-counts').innerText(), { timeout: 90_000 }).toMatch(/New\s+60,000\b/i);

    // What the server answered to each poll, to tell a bar that moved back from an answer that did.
    const answers: string[] = [];
    page.on('response', (r) => {
      if (/\/api\/orbit\/uploads\/[^/]+(\/import)?$/.test(new URL(r.url()).pathname))
        void r
          .json()
          .then((b: { upload: { status: string; progress: { processed: number; total: number } } }) =>
            answers.push(`${b.upload.status} ${b.upload.progress.processed}/${b.upload.progress.total}`),
          )
          .catch(() => undefined);
    });
    await preview.getByRole('button', { name: 'Import 60,000 new sets' }).click();
    const bar = () => reading(preview, 'Importing the sets');
    // Sample the bar while the worker imports: it only moves forward, and the screenshots catch it part-way when they can.
    const samples: Array<{ now: number; max: number }> = [];
    let shotMidway = false;
    for (let i = 0; i < 600; i++) {
      const r = await bar();
      if (r) samples.push(r);
      const midway = async () => {
        const m = await bar();
        return !!m && m.now > 0 && m.now < m.max;
      };
      if (!shotMidway && (await midway())) {
        // Kept only when the bar was still part-way once the picture was taken; otherwise tried again.
        await shot(page, 'orbit-11-import-progress-desktop');
        await page.setViewportSize({ width: 390, height: 844 });
        await shot(page, 'orbit-12-import-progress-phone');
        shotMidway = await midway();
        await page.setViewportSize({ width: 1280, height: 860 });
      }
      if ((await preview.getByRole('heading', { name: 'Imported' }).count()) > 0) break;
      await page.waitForTimeout(50);
    }
    await preview.getByRole('heading', { name: 'Imported' }).waitFor({ timeout: 60_000 });
    expect(samples.length).toBeGreaterThan(0);
    for (let k = 1; k < samples.length; k++)
      expect(samples[k]!.now, `bar: ${JSON.stringify(samples)}; answers: ${answers.join(', ')}`).toBeGreaterThanOrEqual(
        samples[k - 1]!.now,
      );
    expect(await preview.getByTestId('upload-message').innerText()).toBe('Imported 60,000 element sets.');
    await shot(page, 'orbit-13-import-done-desktop');
    await page.setViewportSize({ width: 390, height: 844 });
    await shot(page, 'orbit-14-import-done-phone');
    const overflow = await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);
    expect(overflow).toBeLessThanOrEqual(0);
    expect(problems).toEqual([]);
    await context.close();
  }, 240_000);
});
