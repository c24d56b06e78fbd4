// Books in the browser: finance starts a reconciliation run, watches its progress bar (the worker stores
// progress on the run; the page polls it), sees the findings and records the missing one, refunds part of a
// pledge from its page (pending until the webhook books it), closes last month after a clean run, publishes its
// account and downloads its report; the backer downloads the receipt PDF from my support, whose first page is
// rendered to PNG with poppler's pdftoppm and checked.
import { execFileSync, spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it, inject } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import { imageSize } from 'image-size';
import { launchBrowser, newPage, screenshotDir, shot, signInAs } from './browser';
import { DEMO_PASSWORD } from '../../server/demo/accounts';

const baseUrl = inject('baseUrl');
const paymentsUrl = inject('paymentsUrl');
let browser: Browser;

/** poppler-utils from Debian, installed the way the scripts install PostgreSQL and chromium when missing. */
function ensurePdftoppm(): string {
  const bin = '/usr/bin/pdftoppm';
  if (existsSync(bin)) return bin;
  process.stdout.write("[e2e] pdftoppm not found: installing Debian's poppler-utils (apt-get)\n");
  const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' };
  execFileSync('apt-get', ['update', '-qq'], { stdio: 'inherit', env });
  execFileSync('apt-get', ['install', '-y', '-qq', 'poppler-utils'], { stdio: 'inherit', env });
  if (!existsSync(bin)) throw new Error('poppler-utils was installed but /usr/bin/pdftoppm is missing');
  return bin;
}

beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await fetch(`${paymentsUrl}/_fake/faults`, { method: 'DELETE' });
  await browser?.close();
});

const faults = (body: Record<string, unknown>) =>
  fetch(`${paymentsUrl}/_fake/faults`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify(body) });

async function payOnHostedPage(page: Page, card: string) {
  await page.waitForURL((u) => u.href.startsWith(paymentsUrl));
  await page.getByLabel('Card number').fill(card);
  await page.getByLabel('Expiry (MM / YY)').fill('12 / 34');
  await page.getByLabel('Security code').fill('123');
  await page.getByLabel('Name on card').fill('Wren Dunlin');
  await page.getByRole('button', { name: /^(Pay|Subscribe)/ }).click();
}

async function pledge(page: Page, dollars: string) {
  await page.goto(`${baseUrl}/campaign`);
  await page
    .getByRole('listitem')
    .filter({ has: page.getByRole('heading', { name: 'Mission patch' }) })
    .getByRole('link', { name: /^Pledge .* or more$/ })
    .click();
  await page.getByLabel(/^Amount/).fill(dollars);
  await page.getByRole('button', { name: 'Continue to payment' }).click();
  await payOnHostedPage(page, '4242 4242 4242 4242');
  await page.waitForURL(/\/pledges\/[0-9a-f-]+\/(thanks|cancelled)/);
}

describe('books in the browser', () => {
  it('finance runs a reconciliation, sees its progress and then the findings; the backer downloads a receipt PDF', async () => {
    // The backer pays one pledge normally and one whose webhook never arrives (a finding for finance).
    const backer = await newPage(browser);
    await signInAs(backer.page, baseUrl, 'backer@saltmarsh.example', DEMO_PASSWORD);
    await pledge(backer.page, '37');
    await backer.page.getByRole('heading', { name: 'Thank you — your pledge is in' }).waitFor({ timeout: 30_000 });
    await faults({ dropWebhooks: true });
    await pledge(backer.page, '41');
    await faults({ dropWebhooks: false });

    // Finance: a slow processor (latency per request) so the run's progress is seen moving.
    const finance = await newPage(browser);
    await signInAs(finance.page, baseUrl, 'finance@saltmarsh.example', DEMO_PASSWORD);
    await finance.page.goto(`${baseUrl}/console/books`);
    await finance.page.getByRole('navigation', { name: 'Books' }).getByRole('link', { name: 'Reconcile' }).click();
    const today = new Date().toISOString().slice(0, 10);
    await finance.page.getByLabel('From', { exact: true }).fill(new Date(Date.now() - 3 * 86_400_000).toISOString().slice(0, 10));
    await finance.page.getByLabel('To', { exact: true }).fill(today);
    await faults({ latencyMs: 1500 });
    await finance.page.getByRole('button', { name: 'Compare with the processor' }).click();
    const bar = finance.page.getByRole('progressbar', { name: 'Reconciliation run progress' });
    await bar.waitFor({ timeout: 30_000 });
    const total = Number(await bar.getAttribute('aria-valuemax'));
    expect(total).toBe(4 + 2); // four days fetched, matching, payouts
    await expect.poll(async () => Number(await bar.getAttribute('aria-valuenow')), { timeout: 30_000 }).toBeGreaterThan(0);
    expect(await bar.getAttribute('aria-valuetext')).toMatch(/of 6 steps/);
    await shot(finance.page, 'books-01-reconciliation-progress-desktop');
    await finance.page.setViewportSize({ width: 390, height: 844 });
    await shot(finance.page, 'books-02-reconciliation-progress-phone');
    await finance.page.setViewportSize({ width: 1280, height: 860 });
    await faults({ latencyMs: 0 });

    const findings = finance.page.getByRole('table', { name: 'Findings' });
    await findings.waitFor({ timeout: 60_000 });
    await expect(bar.count()).resolves.toBe(0);
    const missing = findings.getByRole('row').filter({ hasText: 'At the processor, not in the ledger' }).filter({ hasText: '$41.00' });
    await expect.poll(() => missing.count()).toBe(1);
    await shot(finance.page, 'books-03-findings-desktop');
    await finance.page.setViewportSize({ width: 390, height: 844 });
    await shot(finance.page, 'books-04-findings-phone');
    await finance.page.setViewportSize({ width: 1280, height: 860 });
    await missing.getByRole('button', { name: 'Record from processor' }).click();
    await expect
      .poll(async () => `${await missing.innerText()} ${await finance.page.getByRole('alert').allInnerTexts()}`, { timeout: 30_000 })
      .toMatch(/resolved \(record from processor\)/);
    await shot(finance.page, 'books-08-finding-resolved-desktop');

    // Finance refunds $10 of the $37 pledge from its page in books: pending until the processor's webhook books it.
    await finance.page.getByRole('navigation', { name: 'Books' }).getByRole('link', { name: 'Pledges and refunds' }).click();
    await finance.page.getByLabel('Backer’s e-mail or name, or the pledge id').fill('backer@saltmarsh.example');
    const pledges = finance.page.getByRole('table', { name: 'Pledges, newest first' });
    await pledges.getByRole('link', { name: '$37.00' }).first().click();
    await finance.page.getByRole('heading', { name: 'Payments and refunds' }).waitFor();
    const amount = finance.page.getByLabel('Amount in USD');
    expect(await amount.inputValue()).toBe('37.00'); // the whole payment is offered
    await amount.fill('40');
    await finance.page.getByRole('button', { name: 'Refund…' }).click();
    await expect.poll(() => finance.page.getByText('At most $37.00 is left to refund on this payment.').count()).toBe(1);
    await amount.fill('10');
    await finance.page.getByLabel('Reason').selectOption({ label: 'Goodwill' });
    await finance.page.getByRole('button', { name: 'Refund…' }).click();
    const confirm = finance.page.getByRole('dialog', { name: 'Refund $10.00?' });
    await confirm.getByRole('button', { name: 'Send the refund' }).click();
    const refundRow = finance.page.getByTestId('refund').filter({ hasText: '$10.00' });
    await expect.poll(() => refundRow.innerText(), { timeout: 30_000 }).toMatch(/Goodwill.*in the ledger/s);
    await expect.poll(() => finance.page.getByText('$27.00 can still be refunded').count(), { timeout: 10_000 }).toBe(1);
    await shot(finance.page, 'books-09-pledge-refunded-desktop');
    await finance.page.setViewportSize({ width: 390, height: 844 });
    await shot(finance.page, 'books-10-pledge-refunded-phone');
    await finance.page.setViewportSize({ width: 1280, height: 860 });

    // Last month: reconcile all of it (nothing differs), close it, read and download its report, publish its account.
    const last = new Date(Date.UTC(new Date().getUTCFullYear(), new Date().getUTCMonth() - 1, 1)).toISOString().slice(0, 7);
    await finance.page.getByRole('navigation', { name: 'Books' }).getByRole('link', { name: 'Reconcile' }).click();
    await finance.page.getByRole('button', { name: 'All of last month' }).click();
    expect(await finance.page.getByLabel('From', { exact: true }).inputValue()).toBe(`${last}-01`);
    await finance.page.getByRole('button', { name: 'Compare with the processor' }).click();
    await finance.page.getByText(/processor transactions, \d+ matched, 0 finding\(s\)/).waitFor({ timeout: 60_000 });
    await finance.page.getByRole('navigation', { name: 'Books' }).getByRole('link', { name: 'Months' }).click();
    await finance.page.getByRole('button', { name: `Close month ${last}` }).click();
    await finance.page
      .getByRole('dialog', { name: `Close ${last}?` })
      .getByRole('button', { name: 'Close the month' })
      .click();
    const monthRow = finance.page.getByRole('row').filter({ hasText: last });
    await monthRow.getByText('closed', { exact: true }).waitFor({ timeout: 15_000 });
    await monthRow.getByRole('button', { name: `Publish the account of ${last}` }).click();
    await finance.page
      .getByRole('dialog', { name: `Publish the account of ${last}?` })
      .getByRole('button', { name: 'Publish for backers' })
      .click();
    await monthRow.getByText('account published').waitFor({ timeout: 15_000 });
    await shot(finance.page, 'books-11-month-closed-desktop');
    await monthRow.getByRole('link', { name: `Close report for ${last}`, exact: true }).click();
    await finance.page.getByRole('heading', { name: `Close report ${last}` }).waitFor();
    await finance.page.getByRole('table', { name: `Totals for ${last}` }).waitFor();
    await shot(finance.page, 'books-12-month-report-desktop');
    await finance.page.setViewportSize({ width: 390, height: 844 });
    await shot(finance.page, 'books-13-month-report-phone');
    await finance.page.setViewportSize({ width: 1280, height: 860 });
    const [reportDownload] = await Promise.all([
      finance.page.waitForEvent('download'),
      finance.page.getByRole('link', { name: 'Download as PDF' }).click(),
    ]);
    expect(reportDownload.suggestedFilename()).toBe(`close-report-${last}.pdf`);
    const reportPath = path.join(mkdtempSync(path.join(os.tmpdir(), 'lightkeel-report-')), reportDownload.suggestedFilename());
    await reportDownload.saveAs(reportPath);
    ensurePdftoppm(); // poppler-utils brings pdftotext too
    const reportText = spawnSync('/usr/bin/pdftotext', ['-layout', reportPath, '-'], { encoding: 'utf8' }).stdout;
    expect(reportText).toContain(last);
    expect(finance.problems).toEqual([]);

    // The published account is on the campaign page for everyone: totals for the month, no names.
    await backer.page.setViewportSize({ width: 1280, height: 860 });
    await backer.page.goto(`${baseUrl}/campaign`);
    const accounts = backer.page.getByRole('table', { name: 'Published monthly accounts' });
    const monthName = new Date(`${last}-01T00:00:00Z`).toLocaleDateString('en-GB', { month: 'long', year: 'numeric', timeZone: 'UTC' });
    const accountRow = accounts.getByRole('row').filter({ hasText: monthName });
    await expect.poll(() => accountRow.count(), { timeout: 15_000 }).toBe(1);
    expect(await accountRow.innerText()).toMatch(/\$[\d,]+\.\d{2}/);
    expect(await accounts.innerText()).not.toMatch(/@/);
    await accounts.scrollIntoViewIfNeeded();
    await shot(backer.page, 'books-14-public-monthly-account');

    // The backer: my support → the $37 payment's receipt → the PDF.
    await backer.page.goto(`${baseUrl}/my-support/pledges`);
    const mine = backer.page.getByTestId('my-pledge').filter({ hasText: '$37.00' });
    await mine
      .first()
      .getByRole('link', { name: /Receipt/ })
      .first()
      .click();
    await backer.page.getByRole('heading', { name: 'Payment receipt' }).waitFor();
    await shot(backer.page, 'books-05-receipt-desktop');
    await backer.page.setViewportSize({ width: 390, height: 844 });
    await shot(backer.page, 'books-06-receipt-phone');
    const [download] = await Promise.all([
      backer.page.waitForEvent('download'),
      backer.page.getByRole('link', { name: 'Download PDF receipt' }).click(),
    ]);
    expect(download.suggestedFilename()).toMatch(/^receipt-\d{6}\.pdf$/);
    const dir = mkdtempSync(path.join(os.tmpdir(), 'lightkeel-receipt-'));
    const pdfPath = path.join(dir, download.suggestedFilename());
    await download.saveAs(pdfPath);
    const pdf = readFileSync(pdfPath);
    expect(pdf.subarray(0, 5).toString()).toBe('%PDF-');
    expect(backer.problems).toEqual([]);

    // First page to PNG at 60 dpi: ISO 216 A4 is 210 × 297 mm = 8.27 × 11.69 in → 496 × 701.6 px.
    const pdftoppm = ensurePdftoppm();
    const out = path.join(screenshotDir, 'books-07-receipt-pdf-page1');
    const r = spawnSync(pdftoppm, ['-png', '-r', '60', '-f', '1', '-l', '1', '-singlefile', pdfPath, out], { encoding: 'utf8' });
    expect(r.status, r.stderr).toBe(0);
    const png = readFileSync(`${out}.png`);
    // pdftoppm rounds each side up: pdfkit's A4 is 595.28 × 841.89 pt → 496.07 × 701.57 px → 497 × 702.
    expect(imageSize(png)).toMatchObject({ width: 497, height: 702 });
    // Not blank: the page holds dark text on white. A grey rendering (pdftoppm -gray writes PGM: a short header,
    // then one byte per pixel) tells how much of the page is ink.
    const gray = spawnSync(pdftoppm, ['-gray', '-r', '30', '-f', '1', '-l', '1', '-singlefile', pdfPath], { maxBuffer: 1 << 24 });
    expect(gray.status).toBe(0);
    const pgm = gray.stdout;
    const headerEnd = pgm.indexOf('\n255\n') + 5;
    const pixels = pgm.subarray(headerEnd);
    const ink = pixels.filter((v) => v < 200).length / pixels.length;
    expect(ink).toBeGreaterThan(0.005); // a receipt rendered by hand: 2.5 % of the page is ink
    expect(ink).toBeLessThan(0.5);
    // The text layer says what the receipt is and carries the caution.
    const text = spawnSync('/usr/bin/pdftotext', ['-layout', pdfPath, '-'], { encoding: 'utf8' }).stdout;
    writeFileSync(path.join(dir, 'receipt.txt'), text);
    expect(text).toMatch(/not tax advice/i);
    expect(text).toMatch(/37\.00/);
  }, 480_000);
});
