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

const dollars = (text: string) => Number(text.replace(/[^0-9.]/g, ''));

async function raisedOnCampaignPage(page: Page) {
  await page.goto(`${baseUrl}/campaign`);
  return dollars(await page.getByTestId('raised').innerText());
}

async function payOnHostedPage(page: Page, card: string) {
  await page.waitForURL((u) => u.href.startsWith(paymentsUrl));
  await page.getByLabel('Card number').fill(card);
  await page.getByLabel('Expiry (MM / YY)').fill('12 / 34');
  await page.getByLabel('Security code').fill('123');
  await page.getByLabel('Name on card').fill('Wren Dunlin');
  await page.getByRole('button', { name: /^(Pay|Subscribe)/ }).click();
}

describe('pledging in the browser', () => {
  it('pledges for a tier with the success card: thanks page after the webhook, in my support, progress moves', async () => {
    const { page, context, problems } = await newPage(browser);
    await signInAs(page, baseUrl, 'backer@saltmarsh.example', DEMO_PASSWORD);
    const before = await raisedOnCampaignPage(page);
    await page.getByRole('heading', { name: 'Mission patch' }).waitFor();
    await shot(page, 'pledge-01-campaign-desktop');

    await page
      .getByRole('listitem')
      .filter({ has: page.getByRole('heading', { name: 'Mission patch' }) })
      .getByRole('link', { name: /^Pledge .* or more$/ })
      .click();
    await page.getByRole('heading', { name: 'Make a pledge' }).waitFor();
    await page.getByLabel(/^Amount/).fill('50');
    await page.getByLabel('Public name').fill('Wren from the e2e test');
    await page.getByLabel(/A message for the team/).fill('Fair winds, Tern-1.');
    await shot(page, 'pledge-02-form-desktop');
    await page.getByRole('button', { name: 'Continue to payment' }).click();

    await payOnHostedPage(page, '4242 4242 4242 4242');
    await page.waitForURL(/\/pledges\/[0-9a-f-]+\/thanks$/);
    await page.getByRole('heading', { name: 'Thank you — your pledge is in' }).waitFor({ timeout: 20_000 });
    await expect.poll(() => page.getByTestId('pledge-state').innerText()).toBe('Paid');
    await shot(page, 'pledge-03-thanks-desktop');

    await page.goto(`${baseUrl}/my-support/pledges`);
    const mine = page.getByTestId('my-pledge').filter({ hasText: '$50.00' });
    await mine.first().waitFor();
    await expect.poll(() => mine.first().innerText()).toMatch(/Paid/);
    await shot(page, 'pledge-04-my-pledges-desktop');
    await mine.first().getByRole('link', { name: 'Receipt' }).click();
    await page.getByRole('heading', { name: 'Payment receipt' }).waitFor();
    expect(await page.getByText(/not tax advice/i).count()).toBe(1);
    await shot(page, 'pledge-05-receipt-desktop');

    // The public endpoint may serve a cached read for a few seconds.
    await expect.poll(async () => raisedOnCampaignPage(page), { timeout: 15_000, interval: 1000 }).toBe(before + 50);
    expect(problems).toEqual([]);
    await context.close();
  });

  it('keeps a pledge with the decline card unpaid and shows why, on desktop and phone width', async () => {
    const { page, context, problems } = await newPage(browser, { width: 390, height: 844 });
    await signInAs(page, baseUrl, 'backer@saltmarsh.example', DEMO_PASSWORD);
    await page.goto(`${baseUrl}/campaign`);
    await page.getByRole('heading', { name: 'Mission patch' }).waitFor();
    await shot(page, 'pledge-06-campaign-phone');
    await page.getByRole('link', { name: 'Support without a gift' }).first().click();
    await page.getByRole('heading', { name: 'Make a pledge' }).waitFor();
    await page.getByLabel('Stay anonymous').check();
    await page.getByLabel(/^Amount/).fill('20');
    await shot(page, 'pledge-07-form-phone');
    await page.getByRole('button', { name: 'Continue to payment' }).click();

    await payOnHostedPage(page, '4000 0000 0000 0002');
    await page
      .getByText(/declined/i)
      .first()
      .waitFor();
    await shot(page, 'pledge-08-hosted-declined-phone');
    await page.getByRole('link', { name: 'Cancel and go back' }).click();

    await page.waitForURL(/\/pledges\/[0-9a-f-]+\/cancelled$/);
    await page.getByRole('heading', { name: 'No payment was taken' }).waitFor();
    await page.getByText('The card was not accepted').waitFor();
    await page.getByText('Your card was declined.').waitFor();
    // Declined, then the checkout closed: the pledge ends cancelled (a closed checkout outranks a decline), and says why.
    expect(await page.getByTestId('pledge-state').innerText()).toBe('Cancelled');
    await shot(page, 'pledge-09-declined-phone');
    await page.setViewportSize({ width: 1280, height: 860 });
    await shot(page, 'pledge-10-declined-desktop');

    await page.goto(`${baseUrl}/my-support/pledges`);
    // A cancelled attempt is folded away under "N earlier attempts".
    await page.getByTestId('earlier-attempts').locator('summary').click();
    const declined = page.getByTestId('earlier-attempt').filter({ hasText: '$20.00' });
    await declined.first().waitFor();
    expect(await declined.first().innerText()).toMatch(/Cancelled[\s\S]*Your card was declined\./);
    expect(problems).toEqual([]);
    await context.close();
  });

  it('joins the crew (a monthly membership) and sees it in my support, where it can be cancelled at period end', async () => {
    const { page, context, problems } = await newPage(browser);
    await signInAs(page, baseUrl, 'backer@saltmarsh.example', DEMO_PASSWORD);
    await page.goto(`${baseUrl}/campaign`);
    await page
      .getByRole('listitem')
      .filter({ has: page.getByRole('heading', { name: 'Crew membership', exact: true }) })
      .getByRole('link', { name: /^Join the crew/ })
      .click();
    await page.getByRole('heading', { name: 'Make a pledge' }).waitFor();
    await page.getByRole('button', { name: 'Continue to payment' }).click();
    await payOnHostedPage(page, '4242 4242 4242 4242');
    await page.getByRole('heading', { name: 'Thank you — your pledge is in' }).waitFor({ timeout: 20_000 });

    await page.goto(`${baseUrl}/my-support/memberships`);
    const membership = page.getByTestId('my-membership').first();
    await membership.waitFor();
    expect(await membership.innerText()).toMatch(/Active[\s\S]*Renews on/);
    await shot(page, 'pledge-11-membership-desktop');
    await membership.getByRole('button', { name: 'Stop renewing…' }).click();
    await page
      .getByRole('dialog')
      .getByRole('button', { name: /^Stop renewing after / })
      .click();
    await expect.poll(() => membership.innerText()).toMatch(/Stops at the end of the period/);
    await shot(page, 'pledge-12-membership-cancelled-desktop');

    await page.setViewportSize({ width: 390, height: 844 });
    await page.goto(`${baseUrl}/my-support/pledges`);
    await page.getByTestId('my-pledge').first().waitFor();
    await shot(page, 'pledge-13-my-pledges-phone');
    expect(problems).toEqual([]);
    await context.close();
  });
});

describe('the campaign desk', () => {
  it('lets outreach change a tier and shows it on the public page', async () => {
    const { page, context, problems } = await newPage(browser);
    await signInAs(page, baseUrl, 'outreach@saltmarsh.example', DEMO_PASSWORD);
    await page.goto(`${baseUrl}/console/campaign`);
    await page.getByRole('heading', { name: 'Campaign desk' }).waitFor();
    await page.getByRole('button', { name: 'Edit Sail log postcard' }).click();
    const form = page.getByRole('form', { name: 'Edit tier Sail log postcard' });
    await form.getByLabel('Title', { exact: true }).fill('Sail log postcard, signed');
    await shot(page, 'pledge-14-campaign-desk-desktop');
    await form.getByRole('button', { name: 'Save tier' }).click();
    await page.getByText('Sail log postcard, signed ·').waitFor();
    await expect
      .poll(
        async () => {
          await page.goto(`${baseUrl}/campaign`);
          // count() does not wait: let the campaign render before counting its tier headings.
          await page.getByRole('heading', { name: 'Thank-you gifts' }).waitFor();
          return page.getByRole('heading', { name: 'Sail log postcard, signed' }).count();
        },
        { timeout: 15_000, interval: 1000 },
      )
      .toBe(1);
    expect(problems).toEqual([]);
    await context.close();
  });
});
