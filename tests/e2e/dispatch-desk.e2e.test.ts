import { afterAll, beforeAll, describe, expect, it, inject } from 'vitest';
import pg from 'pg';
import type { Browser } from 'playwright-core';
import { launchBrowser, newPage, shot, signInAs } from './browser';
import { DEMO_PASSWORD } from '../../server/demo/accounts';
import { Resvg } from '@resvg/resvg-js';

const baseUrl = inject('baseUrl');
const outboxUrl = inject('outboxUrl');
let browser: Browser;
let pool: pg.Pool;
beforeAll(async () => {
  browser = await launchBrowser();
  pool = new pg.Pool({ connectionString: inject('databaseUrl'), max: 2 });
});
afterAll(async () => {
  await browser?.close();
  await pool?.end();
});

type FakeMessage = { id: string; to: string[]; subject: string; html?: string; headers?: Record<string, string> };

/** Three backers declared beside the demo seed: two back the postcard tier, one the patch tier. */
async function declareBackers(tag: string) {
  // By the start of the title: the pledge browser test (sharing this database) renames the postcard tier.
  const tier = async (title: string) =>
    (
      await pool.query<{ id: string; campaign_id: string }>(
        "select id, campaign_id from tiers where title like $1 || '%' order by created_at limit 1",
        [title],
      )
    ).rows[0]!;
  const postcard = await tier('Sail log postcard');
  const patch = await tier('Mission patch');
  const people = [
    { email: `heron-${tag}@example.org`, name: 'Ada Heron', tier: postcard },
    { email: `stint-${tag}@example.org`, name: 'Bo Stint', tier: postcard },
    { email: `plover-${tag}@example.org`, name: 'Cy Plover', tier: patch },
  ];
  for (const [i, p] of people.entries()) {
    const acc = await pool.query<{ id: string }>(
      'insert into accounts (email, display_name, email_verified_at) values ($1, $2, now()) returning id',
      [p.email, p.name],
    );
    await pool.query(
      `insert into pledges (campaign_id, tier_id, backer_id, kind, amount_minor, currency, state, idempotency_key, paid_at)
       values ($1, $2, $3, 'one-time', 1500, 'USD', 'paid', $4, now())`,
      [p.tier.campaign_id, p.tier.id, acc.rows[0]!.id, `e2e-dispatch-${tag}-${i}`],
    );
  }
  return { postcardEmails: people.slice(0, 2).map((p) => p.email), patchEmail: people[2]!.email };
}

describe('the dispatch desk in the browser', () => {
  it('writes a dispatch with a chart snapshot and a hero image, publishes it to a tier and watches the mail reach 100 %', async () => {
    const tag = Date.now().toString(36);
    const { postcardEmails, patchEmail } = await declareBackers(tag);
    const title = `Sail fully open, week ${tag}`;

    const { page, context, problems } = await newPage(browser);
    await signInAs(page, baseUrl, 'outreach@saltmarsh.example', DEMO_PASSWORD);
    await page.goto(`${baseUrl}/console/dispatches/new`);
    await page.getByRole('heading', { name: 'New dispatch', level: 1 }).waitFor();
    await page.getByLabel('Title').fill(title);
    await page.getByLabel('Body (Markdown)').fill('The sail is **fully open**. Apogee rose 120 m this week.\n\n- raising\n- steady');
    await page.getByRole('region', { name: 'Preview' }).locator('strong', { hasText: 'fully open' }).waitFor();

    await page.getByRole('radio', { name: 'Backers of chosen tiers' }).check();
    await page.getByRole('checkbox', { name: /^Sail log postcard/ }).check();

    // The snapshot is picked from its thumbnail: a radio labelled by the snapshot's title, with the chart image.
    const picker = page.getByTestId('snapshot-picker');
    const firstSnapshot = picker.getByRole('radio').nth(1);
    await firstSnapshot.waitFor();
    const snapshotLabel = picker.locator('label').nth(1);
    await expect.poll(async () => snapshotLabel.locator('img').evaluate((img: HTMLImageElement) => img.naturalWidth)).toBeGreaterThan(0);
    await firstSnapshot.check();
    await page.getByLabel('Chart description (alt text)').fill('Apogee and perigee rising over three weeks');
    await page.getByLabel('E-mail the audience when it is published').check();
    await page.getByRole('button', { name: 'Save', exact: true }).click();
    await page.waitForURL(/\/console\/dispatches\/[0-9a-f-]{36}$/);
    await page.getByRole('heading', { name: title, level: 1 }).waitFor();

    // Hero image: a wrong type is refused in words before anything is sent; an image is previewed, then needs its description.
    const hero = page.getByRole('group', { name: 'Hero image' });
    await hero.getByLabel('Image file').setInputFiles({ name: 'notes.txt', mimeType: 'text/plain', buffer: Buffer.from('not an image') });
    await hero.getByRole('alert').getByText('Choose a PNG, JPEG, WebP or GIF image').waitFor();
    // A small picture drawn here: a pale sail on a night sky, 640 × 360.
    const png = new Resvg(
      '<svg xmlns="http://www.w3.org/2000/svg" width="640" height="360"><rect width="640" height="360" fill="#0b1020"/>' +
        '<polygon points="200,60 440,60 440,300 200,300" fill="#e8d9a8" transform="rotate(45 320 180)"/></svg>',
    )
      .render()
      .asPng();
    await hero.getByLabel('Image file').setInputFiles({ name: 'sail.png', mimeType: 'image/png', buffer: png });
    await expect
      .poll(async () => hero.getByTestId('hero-preview').evaluate((img: HTMLImageElement) => img.naturalWidth))
      .toBeGreaterThan(0);
    await hero.getByRole('button', { name: 'Upload image' }).click();
    await hero.getByText('Describe the image for readers who cannot see it').waitFor();
    await hero.getByLabel('Image description (alt text)').fill('The sail unfolded behind the craft');
    await hero.getByRole('button', { name: 'Upload image' }).click();
    await hero.getByText('Hero image uploaded').waitFor();
    await expect.poll(async () => hero.getByTestId('hero-preview').getAttribute('src')).toMatch(/^\/api\/files\/heroes\//);
    // The header is sticky: from the top, a full-page shot shows it once, where it belongs.
    await page.evaluate(() => window.scrollTo(0, 0));
    await shot(page, 'dispatch-01-editor-desktop');
    await page.setViewportSize({ width: 390, height: 844 });
    await shot(page, 'dispatch-02-editor-phone');
    await page.setViewportSize({ width: 1280, height: 860 });

    await page.getByRole('button', { name: 'Publish now' }).click();
    await page.getByText('Published', { exact: true }).first().waitFor();
    const counts = page.getByTestId('send-counts');
    await expect.poll(async () => (await counts.count()) > 0 && (await counts.innerText()), { timeout: 30_000 }).toMatch(/^100 %/);
    expect(await counts.innerText()).toMatch(/0 queued · 2 sent · 0 failed · 2 recipients/);
    expect(await page.getByRole('progressbar', { name: 'Messages handled' }).getAttribute('aria-valuenow')).toBe('100');
    await page.evaluate(() => window.scrollTo(0, 0));
    await shot(page, 'dispatch-03-sent-desktop');
    await page.setViewportSize({ width: 390, height: 844 });
    await shot(page, 'dispatch-04-sent-phone');
    expect(problems).toEqual([]);
    await context.close();

    // The mail fake, read through its own API: one message to each postcard backer, none to anyone else.
    const all = (await (await fetch(`${outboxUrl}/_fake/messages`)).json()).data as FakeMessage[];
    const sent = all.filter((m) => m.subject.includes(title));
    expect(sent.map((m) => m.to.join(',')).sort()).toEqual([...postcardEmails].sort());
    expect(sent.some((m) => m.to.includes(patchEmail) || m.to.includes('backer@saltmarsh.example'))).toBe(false);
    for (const m of sent) {
      const img = /<img[^>]*alt="Apogee and perigee rising over three weeks"[^>]*>/.exec(m.html ?? '')?.[0] ?? '';
      const src = /src="([^"]+\.png)"/.exec(img)?.[1];
      expect(src, m.html).toMatch(/^http:\/\/127\.0\.0\.1:\d+\/.+\.png$/);
      const chart = await fetch(src!);
      expect(chart.status).toBe(200);
      expect(chart.headers.get('content-type')).toBe('image/png');
      expect(m.headers?.['List-Unsubscribe-Post']).toBe('List-Unsubscribe=One-Click');
    }

    // The outbox page shows the message with the chart image.
    const outbox = await newPage(browser);
    await outbox.page.goto(`${outboxUrl}/outbox/${sent[0]!.id}`);
    await outbox.page.getByText(title).first().waitFor();
    // The message's HTML is framed by the outbox; the chart is loaded from the app on loopback.
    const frame = outbox.page.frameLocator('iframe').first();
    const chartImg = frame.locator('img[alt="Apogee and perigee rising over three weeks"]');
    await expect.poll(async () => chartImg.evaluate((img: HTMLImageElement) => img.naturalWidth), { timeout: 10_000 }).toBeGreaterThan(0);
    await shot(outbox.page, 'dispatch-05-outbox-message');
    await outbox.context.close();
  });
});
