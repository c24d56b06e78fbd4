// The campaign desk's flight-budget editor in the browser: add, edit, reorder by keyboard, remove, field errors,
// the goal as the sum of the lines, and what the API then holds (minor units, in the order shown).
import { afterAll, beforeAll, describe, expect, it, inject } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import { launchBrowser, newPage, shot, signInAs } from './browser';
import { DEMO_PASSWORD } from '../../server/demo/accounts';

const baseUrl = inject('baseUrl');
let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => browser?.close());

type Line = { name: string; amountMinor: number; reason: string };
const usd = (minor: number) => new Intl.NumberFormat('en-US', { style: 'currency', currency: 'USD' }).format(minor / 100);

async function managed(page: Page) {
  const { campaign } = await (await page.request.get(`${baseUrl}/api/campaigns/tern-1/manage`)).json();
  return campaign as { goalMinor: number; budgetLines: Line[] };
}

async function names(page: Page) {
  return page
    .getByTestId('budget-line-editor')
    .evaluateAll((els) => els.map((el) => (el.querySelector('input') as HTMLInputElement).value));
}

describe('the flight-budget editor', () => {
  it('adds, edits, reorders by keyboard and removes lines, with field errors and the goal as their sum', async () => {
    const { page, context, problems } = await newPage(browser);
    await signInAs(page, baseUrl, 'outreach@saltmarsh.example', DEMO_PASSWORD);
    const before = await managed(page);
    expect(before.budgetLines.length).toBeGreaterThan(2);
    await page.goto(`${baseUrl}/console/campaign`);
    await page.getByRole('heading', { name: 'Flight budget', exact: true }).waitFor();
    const goal = page.getByTestId('budget-goal');
    const sum = (lines: { amountMinor: number }[]) => lines.reduce((s, l) => s + l.amountMinor, 0);
    expect(await goal.innerText()).toBe(`Goal (sum of the lines): ${usd(sum(before.budgetLines))}`);
    expect(await names(page)).toEqual(before.budgetLines.map((l) => l.name));

    // Add a line: the amount is typed in dollars, shown formatted, and counted in the goal at once.
    await page.getByRole('button', { name: 'Add a budget line' }).click();
    const rows = page.getByTestId('budget-line-editor');
    const added = rows.last();
    await added.getByLabel('Name').fill('x');
    await added.getByLabel('Amount (USD)').fill('twelve');
    await page.getByRole('button', { name: 'Save flight budget' }).click();
    await added.getByText('Name the budget line in at least 2 characters.').waitFor();
    await added.getByText('Type the amount in USD, e.g. 12000 or 12000.50.').waitFor();
    expect(await added.getByLabel('Name').getAttribute('aria-invalid')).toBe('true');
    // The first wrong field has the keyboard.
    expect(await added.getByLabel('Name').evaluate((el) => el === document.activeElement)).toBe(true);
    await shot(page, 'support12-budget-errors-desktop');

    await added.getByLabel('Name').fill('Spare sail roll');
    await added.getByLabel('Amount (USD)').fill('1234.5');
    await added.getByText('$1,234.50').waitFor();
    expect(await goal.innerText()).toBe(`Goal (sum of the lines): ${usd(sum(before.budgetLines) + 123_450)}`);

    // Keyboard reorder: Enter on "Move up" twice (focus stays on the button), then Alt+↓ on the line once.
    const n = before.budgetLines.length + 1;
    await added.getByRole('button', { name: 'Move up Spare sail roll' }).focus();
    await page.keyboard.press('Enter');
    await page.keyboard.press('Enter');
    expect((await names(page))[n - 3]).toBe('Spare sail roll');
    await page.keyboard.press('Alt+ArrowDown');
    expect((await names(page))[n - 2]).toBe('Spare sail roll');
    await page.getByText(`Spare sail roll moved to position ${n - 1} of ${n}.`).waitFor({ state: 'attached' });
    const order = await names(page);

    await page.getByRole('button', { name: 'Save flight budget' }).click();
    await page.getByText(`Flight budget saved. The goal is now ${usd(sum(before.budgetLines) + 123_450)}.`).waitFor();
    await shot(page, 'support12-budget-saved-desktop');
    const saved = await managed(page);
    expect(saved.budgetLines.map((l) => l.name)).toEqual(order);
    expect(saved.budgetLines.find((l) => l.name === 'Spare sail roll')!.amountMinor).toBe(123_450);
    expect(saved.goalMinor).toBe(sum(before.budgetLines) + 123_450);

    await page.setViewportSize({ width: 390, height: 844 });
    await page.getByRole('heading', { name: 'Flight budget', exact: true }).scrollIntoViewIfNeeded();
    await shot(page, 'support12-budget-phone');
    await page.setViewportSize({ width: 1280, height: 860 });

    // Remove it again: back to the lines, order and goal the campaign had.
    await page.getByRole('button', { name: 'Remove Spare sail roll' }).click();
    await page.getByText('Spare sail roll removed.').waitFor({ state: 'attached' });
    await page.getByRole('button', { name: 'Save flight budget' }).click();
    await page.getByText(`Flight budget saved. The goal is now ${usd(sum(before.budgetLines))}.`).waitFor();
    const after = await managed(page);
    expect(after.budgetLines.map(({ name, amountMinor, reason }) => ({ name, amountMinor, reason }))).toEqual(
      before.budgetLines.map(({ name, amountMinor, reason }) => ({ name, amountMinor, reason })),
    );
    expect(after.goalMinor).toBe(before.goalMinor);
    expect(problems).toEqual([]);
    await context.close();
  });
});
