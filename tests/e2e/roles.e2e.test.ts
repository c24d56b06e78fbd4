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

// What each role's console navigation shows; a backer has no console at all.
const sections = ['Orbit desk', 'Dispatch desk', 'Snapshot gallery', 'Books', 'People'];
const expected: Record<string, string[]> = {
  backer: [],
  outreach: ['Dispatch desk', 'Snapshot gallery'],
  engineer: ['Orbit desk'],
  finance: ['Books'],
  admin: sections,
};

describe('each role sees its own navigation', () => {
  for (const [role, visible] of Object.entries(expected)) {
    it(`${role}`, async () => {
      const { page, context, problems } = await newPage(browser);
      await signInAs(page, baseUrl, `${role}@saltmarsh.example`, DEMO_PASSWORD);
      await page.goto(`${baseUrl}/console`);
      if (visible.length === 0) {
        // The console refuses a backer and says why; my support is where a backer goes.
        await expect.poll(() => page.getByText(/not (open|available)|staff|no access|permission/i).count()).toBeGreaterThan(0);
        await page.goto(`${baseUrl}/my-support`);
        await page.getByRole('heading', { level: 1 }).first().waitFor();
      } else {
        const nav = page.getByRole('navigation', { name: /console/i });
        await nav.waitFor();
        for (const s of sections) {
          const count = await nav.getByRole('link', { name: s }).count();
          expect(count > 0, `${role} sees "${s}"`).toBe(visible.includes(s));
        }
      }
      await shot(page, `roles-${role}`);
      expect(problems).toEqual([]);
      await context.close();
    });
  }

  it('works at phone width: the menu opens from a button', async () => {
    const { page, context, problems } = await newPage(browser, { width: 390, height: 844 });
    await page.goto(`${baseUrl}/`);
    await page.getByRole('button', { name: /menu/i }).first().click();
    await expect
      .poll(() =>
        page
          .getByRole('link', { name: /sign in/i })
          .first()
          .isVisible(),
      )
      .toBe(true);
    await shot(page, 'home-phone-menu');
    expect(problems).toEqual([]);
    await context.close();
  });
});
