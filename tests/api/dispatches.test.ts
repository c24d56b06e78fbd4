import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { agentFor, type Agent } from '../setup/test-app';
import { renderEmail } from '../../emails/render';
import { renderMarkdown } from '../../server/lib/markdown';
import { accounts, emailPreferences } from '../../server/modules/accounts/accounts.tables';
import { resolveRecipients } from '../../server/modules/dispatches/audience';
import { signUnsubscribeToken } from '../../server/modules/my-support/unsubscribe';
import { renderSnapshotPng } from '../../server/modules/orbit/snapshot-render';
import { ORBIT_CAUTION } from '../../shared/charts/snapshot-chart';
import {
  as,
  createDispatch,
  dispatchDesk,
  insertMember,
  insertSnapshot,
  insertTiers,
  saveBody,
  snapshotData,
  transition,
} from './dispatches-fixtures';

// Classic payloads, after the OWASP XSS Filter Evasion Cheat Sheet (script tags, event handlers, javascript:
// and data: URLs with case, entity and whitespace tricks, SVG, iframes, style), written as Markdown would carry them.
const XSS: string[] = [
  '<script>alert(1)</script>',
  '<SCRIPT SRC=https://xss.example/xss.js></SCRIPT>',
  '<img src=x onerror=alert(1)>',
  '<IMG SRC="javascript:alert(\'XSS\');">',
  '<IMG SRC=JaVaScRiPt:alert(1)>',
  '<IMG SRC=&#106;&#97;&#118;&#97;&#115;&#99;&#114;&#105;&#112;&#116;&#58;&#97;&#108;&#101;&#114;&#116;&#40;&#39;&#88;&#83;&#83;&#39;&#41;>',
  '<IMG SRC="jav&#x09;ascript:alert(1);">',
  '<svg/onload=alert(1)>',
  '<svg><script>alert(1)</script></svg>',
  '<body onload=alert(1)>',
  '<iframe src="javascript:alert(1)"></iframe>',
  '<a href="javascript:alert(1)">click</a>',
  '<a href="  javascript:alert(1)">spaced</a>',
  '<a href="data:text/html;base64,PHNjcmlwdD5hbGVydCgxKTwvc2NyaXB0Pg==">data</a>',
  '[md link](javascript:alert(1))',
  '[md link](JAVASCRIPT:alert(1))',
  '[md entity](&#x6A;avascript:alert(1))',
  '![md image](data:image/svg+xml;base64,PHN2ZyBvbmxvYWQ9YWxlcnQoMSk+)',
  '![x](x" onerror="alert(1))',
  '<div style="background-image:url(javascript:alert(1))">styled</div>',
  '<object data="javascript:alert(1)"></object>',
  '<embed src="javascript:alert(1)">',
  '<form action="javascript:alert(1)"><button>go</button></form>',
  '<details open ontoggle=alert(1)>',
  '<a href="vbscript:msgbox(1)">vb</a>',
  '<meta http-equiv="refresh" content="0;url=javascript:alert(1)">',
  '<base href="javascript:alert(1)//">',
  '[proto](//evil.example/x)',
  // Last: its unclosed <style> swallows everything after it (dropped, never shown).
  '<math><mtext><table><mglyph><style><img src=x onerror=alert(1)>',
];

/**
 * What must never survive into HTML we serve or send: checked on the tags themselves (a payload shown as
 * escaped text, e.g. `onerror=` after `&lt;`, is harmless words). `ours` allows the layout's inline styles (e-mail).
 */
function expectInert(html: string, ours = false) {
  const tags = [...html.matchAll(/<[^>]*>/g)].map((m) => m[0]);
  for (const tag of tags) {
    expect(tag).not.toMatch(/^<\/?(script|iframe|object|embed|svg|math|form|meta|base|body|details)\b/i);
    expect(tag).not.toMatch(/\son[a-z]+\s*=/i);
    expect(tag).not.toMatch(/(href|src|action|data)\s*=\s*["']?\s*(javascript|vbscript|data):/i);
    if (!ours) expect(tag).not.toMatch(/\sstyle\s*=/i);
    if (/^<a\b/i.test(tag) && !ours) expect(tag).toMatch(/rel="noopener noreferrer nofollow"/);
    // Any URL with a scheme is http(s) or mailto; scheme-less ones are relative to our own site.
    for (const m of tag.matchAll(/\s(?:href|src)="([^"]*)"/gi)) {
      if (/^\s*[a-z][a-z0-9+.-]*:/i.test(m[1]!)) expect(m[1]).toMatch(/^(https?|mailto):/);
      expect(m[1]).not.toMatch(/^\/\//);
    }
  }
  // Text never carries a live '<' that a browser could read as a tag.
  expect(html.replace(/<[^>]*>/g, '')).not.toMatch(/</);
}

let ctx: Awaited<ReturnType<typeof dispatchDesk>>;
let outreach: Agent;
let world: Awaited<ReturnType<typeof insertTiers>>;

beforeAll(async () => {
  ctx = await dispatchDesk();
  outreach = ctx.outreach;
  world = await insertTiers(ctx.t);
});
afterAll(async () => ctx.t.close());

describe('the one Markdown sanitiser', () => {
  it('neutralises every classic XSS payload on the web: the preview and the published page', async () => {
    const md = XSS.map((p, i) => `Case ${i}: ${p}\n`).join('\n');
    const preview = await outreach.post('/api/dispatches/preview').set('x-csrf-token', outreach.csrf).send({ markdown: md }).expect(200);
    expectInert(preview.body.html);
    // Each case still leaves its label: the sanitiser removed the attack, not the post.
    for (let i = 0; i < XSS.length - 1; i++) expect(preview.body.html).toContain(`Case ${i}:`);

    const d = await createDispatch(outreach, { title: 'Hostile body', bodyMarkdown: md });
    await transition(outreach, d.id, { to: 'published' }).expect(200);
    const page = await agentFor(ctx.t.app).get(`/api/public/dispatches/${d.slug}`).expect(200);
    expect(page.body.dispatch.access).toBe('open');
    expectInert(page.body.dispatch.bodyHtml);
    expect(page.body.dispatch.bodyHtml).toBe(preview.body.html);
  });

  it('neutralises the same payloads one by one, and in the e-mail', async () => {
    for (const p of XSS) {
      const web = renderMarkdown(p);
      expectInert(web);
      const mail = await renderEmail('dispatch', {
        title: 'Hostile',
        bodyMarkdown: p,
        excerpt: 'x',
        pageUrl: 'http://127.0.0.1:3999/dispatches/x',
        siteUrl: 'http://127.0.0.1:3999/',
        audienceLine: 'a backer',
        unsubscribeUrl: 'http://127.0.0.1:3999/unsubscribe?token=t',
        choicesUrl: 'http://127.0.0.1:3999/my-support/email',
      });
      // mjml's own layout carries <style> in the head; the body part between the title and the footer must be inert.
      const body = mail.html.slice(mail.html.indexOf('Hostile</div>'), mail.html.indexOf('You get this e-mail'));
      expectInert(body, true);
      expect(mail.text).not.toMatch(/javascript:|<script/i);
    }
  });

  it('keeps safe Markdown: emphasis, lists, https links with rel=noopener, headings below the page title', () => {
    const html = renderMarkdown('# Big\n\n**bold** _em_\n\n- one\n- two\n\n[site](https://tern.example/a?b=1)');
    expect(html).toContain('<h2>Big</h2>');
    expect(html).toContain('<strong>bold</strong>');
    expect(html).toContain('<li>two</li>');
    expect(html).toContain('href="https://tern.example/a?b=1"');
    expect(html).toContain('rel="noopener noreferrer nofollow"');
  });
});

describe('the dispatch desk', () => {
  it('moves a dispatch only along its state table and names the allowed moves', async () => {
    const d = await createDispatch(outreach);
    expect(d.state).toBe('draft');
    const bad = await transition(outreach, d.id, { to: 'withdrawn' }).expect(409);
    expect(bad.body.error.code).toBe('dispatches.bad_transition');
    expect(bad.body.error.message).toMatch(/scheduled, published/);
    const past = await transition(outreach, d.id, { to: 'scheduled', publishAt: '2020-01-01T00:00:00Z' }).expect(400);
    expect(past.body.error.details[0].path).toBe('body.publishAt');
    // Scheduling enqueues the publish job (another dispatch, so this one stays a draft for the moves below).
    const other = await createDispatch(outreach);
    const sched = await transition(outreach, other.id, {
      to: 'scheduled',
      publishAt: new Date(Date.now() + 3600_000).toISOString(),
    }).expect(200);
    expect(sched.body.dispatch.state).toBe('scheduled');
    expect((await outreach.get(`/api/dispatches/${d.id}`).expect(200)).body.dispatch.state).toBe('draft');

    const pub = await transition(outreach, d.id, { to: 'published' }).expect(200);
    expect(pub.body.dispatch).toMatchObject({ state: 'published', version: 1, allowed: ['withdrawn'] });
    await transition(outreach, d.id, { to: 'published' }).expect(409);
    const w = await transition(outreach, d.id, { to: 'withdrawn' }).expect(200);
    expect(w.body.dispatch.state).toBe('withdrawn');
    expect((await agentFor(ctx.t.app).get(`/api/public/dispatches/${d.slug}`)).status).toBe(404);
    await transition(outreach, d.id, { to: 'published' }).expect(200);
    expect((await agentFor(ctx.t.app).get(`/api/public/dispatches/${d.slug}`)).status).toBe(200);
  });

  it('versions edits made after publishing, not before', async () => {
    const d = await createDispatch(outreach, { title: 'Draft one' });
    await outreach
      .put(`/api/dispatches/${d.id}`)
      .set('x-csrf-token', outreach.csrf)
      .send(saveBody({ title: 'Draft two' }))
      .expect(200);
    expect((await outreach.get(`/api/dispatches/${d.id}/versions`).expect(200)).body.versions).toEqual([]);
    await transition(outreach, d.id, { to: 'published' }).expect(200);
    const edit = await outreach
      .put(`/api/dispatches/${d.id}`)
      .set('x-csrf-token', outreach.csrf)
      .send(saveBody({ title: 'Corrected title' }))
      .expect(200);
    expect(edit.body.dispatch.version).toBe(2);
    const versions = (await outreach.get(`/api/dispatches/${d.id}/versions`).expect(200)).body.versions;
    expect(versions.map((v: { version: number; title: string }) => [v.version, v.title])).toEqual([
      [2, 'Corrected title'],
      [1, 'Draft two'],
    ]);
    expect(typeof versions[0].editedBy).toBe('string');
    const page = await agentFor(ctx.t.app).get(`/api/public/dispatches/${d.slug}`).expect(200);
    expect(page.body.dispatch).toMatchObject({ title: 'Corrected title', edited: true });
  });

  it('refuses bad input with the field named and writes nothing', async () => {
    const before = (await outreach.get('/api/dispatches').expect(200)).body.dispatches.length;
    const res = await outreach
      .post('/api/dispatches')
      .set('x-csrf-token', outreach.csrf)
      .send(saveBody({ title: 'Line\nbreak', audience: { kind: 'tiers', tierIds: [] } }))
      .expect(400);
    const paths = res.body.error.details.map((d: { path: string }) => d.path);
    expect(paths).toEqual(expect.arrayContaining(['body.title', 'body.audience.tierIds']));
    const unknownTier = await outreach
      .post('/api/dispatches')
      .set('x-csrf-token', outreach.csrf)
      .send(saveBody({ audience: { kind: 'tiers', tierIds: ['00000000-0000-4000-8000-000000000000'] } }))
      .expect(400);
    expect(unknownTier.body.error.code).toBe('dispatches.tier_not_found');
    expect((await outreach.get('/api/dispatches').expect(200)).body.dispatches.length).toBe(before);
  });

  it('embeds a snapshot as a frozen PNG that carries the orbit caution', async () => {
    const snap = await insertSnapshot(ctx.t.database.db);
    const d = await createDispatch(outreach, { charts: [{ snapshotId: snap.id, alt: 'Apogee climbing 4 km over ten days' }] });
    expect(d.charts).toHaveLength(1);
    const png = await agentFor(ctx.t.app).get(d.charts[0]!.imagePath).expect(200);
    expect(png.headers['content-type']).toBe('image/png');
    expect(png.body.subarray(0, 4).toString('latin1')).toBe('\x89PNG');
    // Same picture as the orbit desk's renderer, which writes the caution into the chart.
    expect(Buffer.compare(png.body, renderSnapshotPng({ title: snap.title, caption: snap.caption, data: snapshotData }))).toBe(0);
    const missing = await outreach
      .post('/api/dispatches')
      .set('x-csrf-token', outreach.csrf)
      .send(saveBody({ charts: [{ snapshotId: '00000000-0000-4000-8000-000000000000', alt: 'x' }] }))
      .expect(400);
    expect(missing.body.error.details[0].path).toBe('charts.0.snapshotId');
  });

  it('the SVG of a snapshot carries the caution line', async () => {
    const { renderSnapshotSvg } = await import('../../server/modules/orbit/snapshot-render');
    const svg = renderSnapshotSvg({ title: 'T', caption: 'C', data: snapshotData });
    expect(svg).toContain(ORBIT_CAUTION);
    expect(svg).toContain('data-role="caution"');
  });

  it('takes a hero image by its bytes, within size and pixel limits', async () => {
    const d = await createDispatch(outreach);
    const png = renderSnapshotPng({ title: 'T', caption: '', data: snapshotData });
    const ok = await outreach
      .post(`/api/dispatches/${d.id}/hero`)
      .set('x-csrf-token', outreach.csrf)
      .field('alt', 'The sail catching sunlight')
      .attach('file', png, { filename: 'sail.jpg', contentType: 'image/jpeg' })
      .expect(200);
    expect(ok.body.dispatch.heroAlt).toBe('The sail catching sunlight');
    expect(ok.body.dispatch.heroImagePath).toMatch(/^\/api\/files\/heroes\/[0-9a-f]{24}\.png$/);
    const served = await agentFor(ctx.t.app).get(ok.body.dispatch.heroImagePath).expect(200);
    expect(served.headers['content-type']).toBe('image/png');
    // Mail clients on other origins must be allowed to draw it.
    expect(served.headers['cross-origin-resource-policy']).toBe('cross-origin');

    const svg = await outreach
      .post(`/api/dispatches/${d.id}/hero`)
      .set('x-csrf-token', outreach.csrf)
      .attach('file', Buffer.from('<svg xmlns="http://www.w3.org/2000/svg" onload="alert(1)"/>'), {
        filename: 'x.png',
        contentType: 'image/png',
      });
    expect(svg.status).toBe(415);
    expect(svg.body.error.message).toMatch(/SVG/);

    // A PNG header claiming 20000 × 20000 pixels (400 MP): refused by its size, before anything is decoded.
    const ihdr = Buffer.alloc(33);
    Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]).copy(ihdr, 0);
    ihdr.writeUInt32BE(13, 8);
    ihdr.write('IHDR', 12, 'latin1');
    ihdr.writeUInt32BE(20000, 16);
    ihdr.writeUInt32BE(20000, 20);
    ihdr[24] = 8;
    ihdr[25] = 6;
    const huge = await outreach
      .post(`/api/dispatches/${d.id}/hero`)
      .set('x-csrf-token', outreach.csrf)
      .attach('file', ihdr, { filename: 'big.png' });
    expect(huge.status).toBe(400);
    expect(huge.body.error.message).toMatch(/20000 × 20000/);

    const tooBig = await outreach
      .post(`/api/dispatches/${d.id}/hero`)
      .set('x-csrf-token', outreach.csrf)
      .attach('file', Buffer.concat([png, Buffer.alloc(ctx.t.config.HERO_IMAGE_MAX_BYTES)]), { filename: 'big.png' });
    expect(tooBig.status).toBe(413);

    // A good image without its description is refused, naming the field; a blank one too.
    for (const alt of [undefined, '   ']) {
      const req = outreach.post(`/api/dispatches/${d.id}/hero`).set('x-csrf-token', outreach.csrf);
      if (alt !== undefined) void req.field('alt', alt);
      const noAlt = await req.attach('file', png, { filename: 'sail.png' });
      expect(noAlt.status).toBe(400);
      expect(noAlt.body.error.code).toBe('dispatches.hero_alt');
      expect(noAlt.body.error.message).toMatch(/describe the image/i);
      expect(noAlt.body.error.details).toEqual([{ path: 'alt', message: 'Describe the image for readers who cannot see it' }]);
    }
    // The failed uploads changed nothing: the first image is still the hero.
    expect((await outreach.get(`/api/dispatches/${d.id}`).expect(200)).body.dispatch.heroImagePath).toBe(ok.body.dispatch.heroImagePath);
  });
});

describe('audiences', () => {
  let ids: Record<string, string>;
  beforeAll(async () => {
    const db = ctx.t.database.db;
    const c = world.campaignId;
    ids = {
      patch: await insertMember(db, c, { email: 'patch@members.example', tierId: world.patch.id }),
      station: await insertMember(db, c, { email: 'station@members.example', tierId: world.fragment.id }),
      crew: await insertMember(db, c, { email: 'crew@members.example', tierId: world.crew.id, crewStatus: 'active' }),
      crewEnded: await insertMember(db, c, { email: 'ended@members.example', tierId: world.crew.id, crewStatus: 'canceled' }),
      refunded: await insertMember(db, c, { email: 'refunded@members.example', tierId: world.patch.id, pledgeState: 'refunded' }),
      quiet: await insertMember(db, c, { email: 'quiet@members.example', tierId: world.patch.id, dispatches: false }),
      follower: await insertMember(db, c, { email: 'follower@members.example' }),
      gone: await insertMember(db, c, { email: 'gone@members.example', tierId: world.patch.id }),
    };
    await db.update(accounts).set({ deletedAt: new Date() }).where(eq(accounts.id, ids.gone!));
  });

  const emails = async (kind: 'everyone' | 'backers' | 'tiers' | 'crew', tierIds: string[] = []) =>
    (await resolveRecipients(ctx.t.database.db, { kind, tierIds }))
      .map((r) => r.email)
      .filter((e) => e.endsWith('@members.example'))
      .sort();

  it('selects backers of chosen tiers, crew members, all backers; unsubscribed, refunded, ended and deleted are left out', async () => {
    expect(await emails('tiers', [world.patch.id])).toEqual(['patch@members.example']);
    expect(await emails('tiers', [world.patch.id, world.fragment.id])).toEqual(['patch@members.example', 'station@members.example']);
    expect(await emails('crew')).toEqual(['crew@members.example']);
    // A crew membership that ended still leaves a paid pledge: that person backed the mission.
    expect(await emails('backers')).toEqual([
      'crew@members.example',
      'ended@members.example',
      'patch@members.example',
      'station@members.example',
    ]);
    expect(await emails('everyone')).toEqual([
      'crew@members.example',
      'ended@members.example',
      'follower@members.example',
      'patch@members.example',
      'refunded@members.example',
      'station@members.example',
    ]);
  });

  it('shows a tier dispatch to its audience and staff, and a clear "for backers" page to others', async () => {
    const db = ctx.t.database.db;
    const d = await createDispatch(outreach, {
      title: 'Patch holders: the sail in detail',
      audience: { kind: 'tiers', tierIds: [world.patch.id] },
    });
    await transition(outreach, d.id, { to: 'published' }).expect(200);

    const anon = await agentFor(ctx.t.app).get(`/api/public/dispatches/${d.slug}`).expect(200);
    expect(anon.body.dispatch).toMatchObject({ access: 'for-backers', title: 'Patch holders: the sail in detail', signedIn: false });
    expect(anon.body.dispatch.bodyHtml).toBeUndefined();
    const feed = await agentFor(ctx.t.app).get('/api/public/dispatches').expect(200);
    const item = feed.body.dispatches.find((x: { slug: string }) => x.slug === d.slug);
    expect(item).toMatchObject({ locked: true, excerpt: '' });

    const backer = await as(ctx.t, 'backer@saltmarsh.example');
    const other = await backer.get(`/api/public/dispatches/${d.slug}`).expect(200);
    expect(other.body.dispatch).toMatchObject({ access: 'for-backers', signedIn: true });

    // The demo backer backs the patch tier: now the page opens.
    const [demo] = await db.select().from(accounts).where(eq(accounts.email, 'backer@saltmarsh.example'));
    await ctx.t.database.pool.query(
      `insert into pledges (campaign_id, tier_id, backer_id, kind, amount_minor, currency, state, idempotency_key)
       values ($1, $2, $3, 'one-time', 2500, 'USD', 'paid', 'demo-backer-patch')`,
      [world.campaignId, world.patch.id, demo!.id],
    );
    const open = await backer.get(`/api/public/dispatches/${d.slug}`).expect(200);
    expect(open.body.dispatch.access).toBe('open');
    expect(open.body.dispatch.bodyHtml).toContain('<strong>opened</strong>');
    const staff = await outreach.get(`/api/public/dispatches/${d.slug}`).expect(200);
    expect(staff.body.dispatch.access).toBe('open');
  });
});

describe('one-click unsubscribe', () => {
  it('honours the RFC 8058 POST at once, without a session or CSRF token, and can be undone', async () => {
    const db = ctx.t.database.db;
    const id = await insertMember(db, world.campaignId, { email: 'leaver@members.example', tierId: world.patch.id });
    const token = signUnsubscribeToken(ctx.t.config.SESSION_SECRET, id, 'dispatches');
    const anon = agentFor(ctx.t.app);
    const res = await anon
      .post(`/api/email-choices/unsubscribe?token=${token}`)
      .type('form')
      .send('List-Unsubscribe=One-Click')
      .expect(200);
    expect(res.body).toEqual({ category: 'dispatches', subscribed: false });
    const [pref] = await db.select().from(emailPreferences).where(eq(emailPreferences.accountId, id));
    expect(pref?.dispatches).toBe(false);
    expect(pref?.receipts).toBe(true);
    expect((await resolveRecipients(db, { kind: 'tiers', tierIds: [world.patch.id] })).map((r) => r.accountId)).not.toContain(id);

    await anon.post(`/api/email-choices/resubscribe?token=${token}`).expect(200);
    const [again] = await db.select().from(emailPreferences).where(eq(emailPreferences.accountId, id));
    expect(again?.dispatches).toBe(true);
  });

  it('refuses a tampered or foreign token and changes nothing', async () => {
    const db = ctx.t.database.db;
    const id = await insertMember(db, world.campaignId, { email: 'stayer@members.example', tierId: world.patch.id });
    const token = signUnsubscribeToken(ctx.t.config.SESSION_SECRET, id, 'dispatches');
    const other = await insertMember(db, world.campaignId, { email: 'victim@members.example', tierId: world.patch.id });
    const forged = `${Buffer.from(`${other}.dispatches`).toString('base64url')}.${token.split('.')[1]}`;
    const wrongKey = signUnsubscribeToken('another-secret-0123456789abcdef', id, 'dispatches');
    for (const t of [forged, wrongKey, `${token}x`, 'short.token']) {
      const res = await agentFor(ctx.t.app).post(`/api/email-choices/unsubscribe?token=${encodeURIComponent(t)}`);
      expect(res.status, t).toBe(400);
    }
    expect(await db.select().from(emailPreferences).where(eq(emailPreferences.accountId, other))).toEqual([]);
  });
});
