// My support in the browser: earlier attempts folded away, "try again" on a declined pledge, and the words of
// the stop-renewal dialog. Pledges are started through the API as the signed-in page; paying happens on the
// payment fake's hosted page, as a backer would.
import { afterAll, beforeAll, describe, expect, it, inject } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import { launchBrowser, newPage, shot, signInAs } from './browser';
import { DEMO_PASSWORD } from '../../server/demo/accounts';

const baseUrl = inject('baseUrl');
const paymentsUrl = inject('paymentsUrl');
let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => browser?.close());

async function csrf(page: Page) {
  return (await (await page.request.get(`${baseUrl}/api/auth/csrf`)).json()).csrfToken as string;
}

async function tierNamed(page: Page, title: string) {
  const { campaign } = await (await page.request.get(`${baseUrl}/api/campaigns/tern-1`)).json();
  const tier = campaign.tiers.find((t: { title: string }) => t.title === title);
  if (!tier) throw new Error(`no tier ${title}`);
  return tier as { id: string; minAmountMinor: number };
}

async function startPledge(page: Page, body: Record<string, unknown>) {
  const res = await page.request.post(`${baseUrl}/api/pledges`, {
    headers: { 'x-csrf-token': await csrf(page) },
    data: { campaignSlug: 'tern-1', attemptKey: crypto.randomUUID(), ...body },
  });
  expect(res.status()).toBe(201);
  return (await res.json()) as { pledge: { id: string }; checkoutUrl: string };
}

async function payOnHostedPage(page: Page, card: string) {
  await page.waitForURL((u) => u.href.startsWith(paymentsUrl));
  await page.getByLabel('Card number').fill(card);
  await page.getByLabel('Expiry (MM / YY)').fill('12 / 34');
  await page.getByLabel('Security code').fill('123');
  await page.getByLabel('Name on card').fill('Wren Dunlin');
  await page.getByRole('button', { name: /^Pay / }).click();
}

describe('my support pledges', () => {
  it('folds cancelled attempts away and tries a declined pledge again for the same gift and amount', async () => {
    const { page, context, problems } = await newPage(browser);
    await signInAs(page, baseUrl, 'backer@saltmarsh.example', DEMO_PASSWORD);
    const patch = await tierNamed(page, 'Mission patch');

    // One attempt left at the checkout, one declined (still open, so "failed").
    const left = await startPledge(page, { tierId: patch.id, amountMinor: patch.minAmountMinor + 111 });
    await page.request.post(`${baseUrl}/api/pledges/${left.pledge.id}/cancel`, { headers: { 'x-csrf-token': await csrf(page) } });
    const declined = await startPledge(page, { tierId: patch.id, amountMinor: patch.minAmountMinor + 222 });
    await page.goto(declined.checkoutUrl);
    await expect.poll(() => page.locator('.paying-for').innerText()).toMatch(/Paying for Tern-1: .* — Mission patch/);
    await shot(page, 'support12-checkout-desktop');
    await payOnHostedPage(page, '4000 0000 0000 0002');
    await page.getByText('Your card was declined.').waitFor();

    await page.goto(`${baseUrl}/my-support/pledges`);
    const amount = (minor: number) => `$${(minor / 100).toFixed(2)}`;
    const failed = page.getByTestId('my-pledge').filter({ hasText: amount(patch.minAmountMinor + 222) });
    await failed.waitFor();
    await expect.poll(() => failed.innerText()).toMatch(/Not paid[\s\S]*Your card was declined\./);
    // The attempt that was left is not in the main list, but behind the disclosure.
    expect(
      await page
        .getByTestId('my-pledge')
        .filter({ hasText: amount(patch.minAmountMinor + 111) })
        .count(),
    ).toBe(0);
    const earlier = page.getByTestId('earlier-attempts');
    const summary = earlier.locator('summary');
    const folded = await page.getByTestId('earlier-attempt').count();
    expect(folded).toBeGreaterThanOrEqual(1);
    expect(await summary.innerText()).toMatch(new RegExp(`^\\S*\\s*${folded} earlier attempts?`));
    expect(await earlier.getAttribute('open')).toBeNull();
    expect(await page.getByTestId('earlier-attempt').first().isVisible()).toBe(false);
    await shot(page, 'support12-pledges-folded-desktop');
    await summary.focus();
    await page.keyboard.press('Enter');
    await page
      .getByTestId('earlier-attempt')
      .filter({ hasText: amount(patch.minAmountMinor + 111) })
      .waitFor();
    expect(
      await page
        .getByTestId('earlier-attempt')
        .filter({ hasText: amount(patch.minAmountMinor + 111) })
        .innerText(),
    ).toMatch(/Cancelled · You left the checkout without paying\. · nothing was taken/);
    await shot(page, 'support12-pledges-open-desktop');
    await page.setViewportSize({ width: 390, height: 844 });
    await shot(page, 'support12-pledges-open-phone');
    await page.setViewportSize({ width: 1280, height: 860 });

    await failed.getByRole('button', { name: 'Try again' }).click();
    await page.waitForURL((u) => u.href.startsWith(paymentsUrl));
    expect(page.url()).not.toBe(declined.checkoutUrl);
    expect(await page.locator('.paying-for').innerText()).toMatch(/— Mission patch$/);
    expect(await page.getByRole('button', { name: /^Pay / }).innerText()).toBe(`Pay ${amount(patch.minAmountMinor + 222)}`);
    await payOnHostedPage(page, '4242 4242 4242 4242');
    await page.waitForURL(/\/thanks$/);

    await page.goto(`${baseUrl}/my-support/pledges`);
    const paid = page.getByTestId('my-pledge').filter({ hasText: amount(patch.minAmountMinor + 222) });
    await expect.poll(() => paid.innerText(), { timeout: 20_000 }).toMatch(/Paid/);
    expect(await paid.count()).toBe(1);
    // The declined attempt is now an earlier one, closed by the new try.
    await expect.poll(() => page.getByTestId('earlier-attempt').count()).toBe(folded + 1);
    expect(problems).toEqual([]);
    await context.close();
  });
});

describe('stopping a crew membership', () => {
  it('says what happens on the button, with the real period end, and "Keep renewing" to leave it as it is', async () => {
    const { page, context, problems } = await newPage(browser);
    await signInAs(page, baseUrl, 'outreach@saltmarsh.example', DEMO_PASSWORD);
    const crew = await tierNamed(page, 'Crew membership');
    const started = await startPledge(page, { tierId: crew.id, amountMinor: crew.minAmountMinor });
    await page.goto(started.checkoutUrl);
    expect(await page.getByRole('button', { name: /^Pay / }).innerText()).toBe(
      `Pay $${(crew.minAmountMinor / 100).toFixed(2)} now, then every month`,
    );
    await shot(page, 'support12-checkout-monthly-desktop');
    await page.setViewportSize({ width: 390, height: 844 });
    await shot(page, 'support12-checkout-monthly-phone');
    await payOnHostedPage(page, '4242 4242 4242 4242');
    await page.waitForURL(/\/thanks$/);

    await page.goto(`${baseUrl}/my-support/memberships`);
    const membership = page.getByTestId('my-membership').first();
    await expect.poll(() => membership.innerText(), { timeout: 20_000 }).toMatch(/Renews on/);
    const { memberships } = await (await page.request.get(`${baseUrl}/api/my-support/memberships`)).json();
    const periodEnd = new Intl.DateTimeFormat('en-GB', { dateStyle: 'medium' }).format(new Date(memberships[0].currentPeriodEnd));
    expect(periodEnd).toMatch(/^\d{1,2} [A-Z][a-z]{2} \d{4}$/);

    await membership.getByRole('button', { name: 'Stop renewing…' }).click();
    const dialog = page.getByRole('dialog');
    await dialog.waitFor();
    const buttons = await dialog.getByRole('button').allInnerTexts();
    expect(buttons).toEqual(['Keep renewing', `Stop renewing after ${periodEnd}`]);
    expect(buttons.join(' ')).not.toMatch(/cancel/i);
    await shot(page, 'support12-stop-renewing-phone');
    await dialog.getByRole('button', { name: 'Keep renewing' }).click();
    await dialog.waitFor({ state: 'hidden' });
    expect(await membership.innerText()).toMatch(/Renews on/);

    await page.setViewportSize({ width: 1280, height: 860 });
    await membership.getByRole('button', { name: 'Stop renewing…' }).click();
    await shot(page, 'support12-stop-renewing-desktop');
    await dialog.getByRole('button', { name: `Stop renewing after ${periodEnd}` }).click();
    await expect.poll(() => membership.innerText()).toMatch(new RegExp(`Stops at the end of the period, on ${periodEnd}`));
    await membership.getByRole('button', { name: 'Keep renewing' }).click();
    await expect.poll(() => membership.innerText()).toMatch(/Renews on/);
    expect(problems).toEqual([]);
    await context.close();
  });
});

describe('saved places', () => {
  it(
    'saves a place from sky watch only when asked, lists it in my support, turns reminders on and deletes it',
    { timeout: 300_000 },
    async () => {
      const { page, context, problems } = await newPage(browser, { width: 390, height: 844 });
      // Signed out, sky watch offers to sign in and stores nothing.
      // Ten days of passes are computed in the page: give a loaded machine time.
      await page.goto(`${baseUrl}/sky-watch?lat=-41.3&lon=174.8`, { timeout: 90_000 });
      await page
        .getByRole('heading', { name: /visible pass(es)? over 41\.3° S, 174\.8° E|No visible pass over/ })
        .waitFor({ timeout: 90_000 });
      await page.getByText('to save this place and get an e-mail before a good pass over it.').waitFor();

      await signInAs(page, baseUrl, 'finance@saltmarsh.example', DEMO_PASSWORD);
      const listed = async () =>
        (await (await page.request.get(`${baseUrl}/api/my-support/places`)).json()) as { places: { name: string }[] };
      expect((await listed()).places).toEqual([]);
      await page.goto(`${baseUrl}/sky-watch?lat=-41.3&lon=174.8`, { timeout: 90_000 });
      const form = page.getByRole('form', { name: 'Save this place' });
      await form.waitFor({ timeout: 90_000 });
      await form.getByRole('button', { name: 'Save place' }).click();
      await form.getByText('Give the place a name, e.g. "Back garden"').waitFor();
      expect((await listed()).places).toEqual([]);
      await form.getByLabel('Save this place as').fill('Dune top');
      await shot(page, 'support12-sky-watch-save-phone');
      await form.getByRole('button', { name: 'Save place' }).click();
      await page.getByText('Saved “Dune top”').waitFor();
      expect((await listed()).places.map((p) => p.name)).toEqual(['Dune top']);

      await page.getByRole('link', { name: 'My support → Saved places' }).click();
      const row = page.getByTestId('saved-place');
      await row.waitFor();
      expect(await row.innerText()).toMatch(/Dune top[\s\S]*41\.30° S, 174\.80° E · times in /);
      const reminders = page.getByLabel('E-mail me before a good pass over my saved places');
      expect(await reminders.isChecked()).toBe(false);
      await reminders.check();
      await expect
        .poll(
          async () =>
            ((await (await page.request.get(`${baseUrl}/api/my-support/places`)).json()) as { passReminders: boolean }).passReminders,
        )
        .toBe(true);
      await shot(page, 'support12-saved-places-phone');
      await page.setViewportSize({ width: 1280, height: 860 });
      await shot(page, 'support12-saved-places-desktop');

      await row
        .getByRole('button', { name: 'Passes' })
        .or(row.getByRole('link', { name: 'Passes over Dune top' }))
        .click();
      await page.waitForURL(/\/sky-watch\?lat=-41\.3&lon=174\.8$/);
      await shot(page, 'support12-sky-watch-linked-desktop');
      await page.goBack();
      await page.getByRole('button', { name: 'Delete Dune top' }).click();
      await page.getByText('No saved places yet').waitFor();
      expect((await listed()).places).toEqual([]);
      expect(problems).toEqual([]);
      await context.close();
    },
  );
});
