import { afterAll, beforeAll, describe, expect, it, inject } from 'vitest';
import type { Browser } from 'playwright-core';
import { readFileSync } from 'node:fs';
import { launchBrowser, newPage, shot } from './browser';

const baseUrl = inject('baseUrl');
let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => browser?.close());

describe('where it is now', () => {
  for (const [label, width, height] of [
    ['desktop', 1280, 860],
    ['phone', 390, 844],
  ] as const) {
    it(`shows the craft on the map and says the same in words (${label})`, async () => {
      const { page, context, problems } = await newPage(browser, { width, height });
      await page.goto(`${baseUrl}/where-it-is-now`);
      const map = page.getByRole('img', { name: /map of where tern-1 is now/i });
      await map.waitFor();
      const words = await page.locator('figcaption').innerText();
      expect(words).toMatch(/Tern-1 is above \d+\.\d° [NS], \d+\.\d° [EW], about \d+ km up, and (in sunlight|in the Earth's shadow)/);
      await expect.poll(() => page.title()).toBe('Where Tern-1 is now · Lightkeel');
      await shot(page, `where-it-is-now-${label}`);
      expect(problems).toEqual([]);
      await context.close();
    });
  }
});

describe('sky watch', () => {
  it('lists the visible passes over a chosen place and hands out a calendar file', async () => {
    const { page, context, problems } = await newPage(browser, { width: 1280, height: 900 });
    await page.goto(`${baseUrl}/sky-watch`);
    await page
      .getByText(/never look at or near the sun/i)
      .first()
      .waitFor();
    await page.getByLabel(/pick a place near you/i).selectOption('Wellington');
    const heading = page.getByRole('heading', { name: /visible pass(es)? over Wellington in the next 10 days/i });
    await heading.waitFor();
    const rows = await page.getByRole('row').count();
    if (rows > 1) {
      const [download] = await Promise.all([
        page.waitForEvent('download'),
        page
          .getByRole('button', { name: /add the pass of/i })
          .first()
          .click(),
      ]);
      const ics = readFileSync(await download.path(), 'utf8');
      expect(ics).toMatch(/^BEGIN:VCALENDAR/);
      expect(ics).toMatch(/SUMMARY:Tern-1 passes over Wellington/);
      expect(ics).toMatch(/DTSTART:\d{8}T\d{4}00Z/);
    }
    await shot(page, 'sky-watch-desktop');
    // A typed place that is not on Earth is refused by the field, in words.
    await page.getByLabel(/latitude/i).fill('123');
    await page.getByRole('button', { name: /find passes/i }).click();
    await page.getByText(/latitude is between -90° \(south pole\) and 90° \(north pole\)/i).waitFor();
    expect(problems).toEqual([]);
    await context.close();
  });

  it('works at phone width', async () => {
    const { page, context, problems } = await newPage(browser, { width: 390, height: 844 });
    await page.goto(`${baseUrl}/sky-watch`);
    await page.getByLabel(/pick a place near you/i).selectOption('Santiago');
    await page.getByRole('heading', { name: /over Santiago/i }).waitFor();
    await shot(page, 'sky-watch-phone');
    expect(problems).toEqual([]);
    await context.close();
  });
});
