// Control characters and broken Unicode in every text field of every JSON route: PostgreSQL refuses a NUL
// byte in `text` and a lone UTF-16 surrogate in `jsonb`, so either reaching the database used to answer
// 500. They must be refused at the edge with a 400 that names the field, and nothing may be written.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { agentFor, type Agent, type TestApp } from '../setup/test-app';
import { routesOf } from '../../server/lib/routes';
import { formatTleFile } from '../../shared/orbit/tle-write';
import { simulateTern1, TERN1 } from '../../shared/orbit/simulate';
import { insertCampaign } from './pledges-fixtures';
import {
  importUpload,
  orbitDesk,
  signedInAs,
  tern1Record,
  tleLines,
  tern1Set,
  upload,
  uploadAndPreview,
  countRows,
  settle,
} from './orbit-helpers';
import { rbacTable } from './rbac.table';

const NUL = '\u0000';
const LONE_HIGH = '\ud800';
const LONE_LOW = '\udc00';
const BAD = [
  { name: 'a NUL byte', value: `Tern${NUL}1` },
  { name: 'a lone high surrogate', value: `Tern${LONE_HIGH}1` },
  { name: 'a lone low surrogate at the end', value: `Tern-1${LONE_LOW}` },
];

const DAY = 86_400_000;

/** Signed-out requests each on a session of their own, so one answer cannot spoil the next one's token. */
async function freshAnon() {
  const a = agentFor(t.app);
  await a.token();
  return a;
}
let t: TestApp;
let engineer: Agent;
let outreach: Agent;
let admin: Agent;
let backer: Agent;
let craftId: string;
let periodId: string;
let snapshotId: string;
let tierId: string;

const someUuid = '00000000-0000-4000-8000-0000000000aa';

type Sample = { route: string; as: () => Agent | Promise<Agent>; url: () => string; body: () => Record<string, unknown> };

const samples: Sample[] = [
  {
    route: 'POST /api/auth/sign-up',
    as: freshAnon,
    url: () => '/api/auth/sign-up',
    body: () => ({ email: 'new-backer@saltmarsh.example', password: 'a-long-enough-password', displayName: 'New Backer' }),
  },
  {
    route: 'POST /api/auth/sign-in',
    as: freshAnon,
    url: () => '/api/auth/sign-in',
    body: () => ({ email: 'backer@saltmarsh.example', password: 'not-the-password' }),
  },
  { route: 'POST /api/auth/verify-email', as: freshAnon, url: () => '/api/auth/verify-email', body: () => ({ token: 'x'.repeat(32) }) },
  {
    route: 'POST /api/auth/request-password-reset',
    as: freshAnon,
    url: () => '/api/auth/request-password-reset',
    body: () => ({ email: 'backer@saltmarsh.example' }),
  },
  {
    route: 'POST /api/auth/reset-password',
    as: freshAnon,
    url: () => '/api/auth/reset-password',
    body: () => ({ token: 'x'.repeat(32), password: 'a-long-enough-password' }),
  },
  { route: 'PATCH /api/account', as: () => backer, url: () => '/api/account', body: () => ({ displayName: 'Backer Renamed' }) },
  {
    route: 'POST /api/admin/accounts/:id/roles',
    as: () => admin,
    url: () => `/api/admin/accounts/00000000-0000-4000-8000-000000000000/roles`,
    body: () => ({ role: 'finance' }),
  },
  {
    route: 'PATCH /api/campaigns/:slug',
    as: () => outreach,
    url: () => '/api/campaigns/tern-1',
    body: () => ({
      title: 'Tern-1 sail test campaign',
      summary: 'A test campaign.',
      story: 'A story.',
      goalMinor: 4_800_000,
      currency: 'USD',
      startsAt: new Date(Date.now() - DAY).toISOString(),
      endsAt: new Date(Date.now() + 30 * DAY).toISOString(),
    }),
  },
  {
    route: 'POST /api/campaigns/:slug/tiers',
    as: () => outreach,
    url: () => '/api/campaigns/tern-1/tiers',
    body: () => ({ title: 'Ground-station hour', description: 'An hour of listening.', minAmountMinor: 5000, kind: 'one-time' }),
  },
  {
    route: 'PATCH /api/campaigns/:slug/tiers/:tierId',
    as: () => outreach,
    url: () => `/api/campaigns/tern-1/tiers/${tierId}`,
    body: () => ({ title: 'Mission patch', description: 'A patch.', minAmountMinor: 2500, kind: 'one-time' }),
  },
  {
    route: 'PUT /api/campaigns/:slug/stretch-targets',
    as: () => outreach,
    url: () => '/api/campaigns/tern-1/stretch-targets',
    body: () => ({ targets: [{ amountMinor: 6_000_000, title: 'Second sail', description: 'A spare.' }] }),
  },
  {
    route: 'PUT /api/campaigns/:slug/budget-lines',
    as: () => outreach,
    url: () => '/api/campaigns/tern-1/budget-lines',
    body: () => ({ lines: [{ name: 'Launch slot', amountMinor: 2_600_000, reason: 'The ride up.' }] }),
  },
  {
    route: 'POST /api/pledges',
    as: () => backer,
    url: () => '/api/pledges',
    body: () => ({
      campaignSlug: 'tern-1',
      tierId: null,
      amountMinor: 1500,
      publicName: 'Marsh Watcher',
      message: 'Fair winds',
      attemptKey: crypto.randomUUID(),
    }),
  },
  {
    route: 'PUT /api/my-support/email-preferences',
    as: () => backer,
    url: () => '/api/my-support/email-preferences',
    body: () => ({ dispatches: true, receipts: true, membership: false }),
  },
  {
    route: 'POST /api/pledges/:id/again',
    as: () => backer,
    url: () => `/api/pledges/${someUuid}/again`,
    body: () => ({ attemptKey: crypto.randomUUID() }),
  },
  {
    route: 'POST /api/my-support/places',
    as: () => backer,
    url: () => '/api/my-support/places',
    body: () => ({ name: 'Dune top', latitudeDeg: -41.3, longitudeDeg: 174.8, timeZone: 'Pacific/Auckland' }),
  },
  {
    route: 'DELETE /api/my-support/account',
    as: () => backer,
    url: () => '/api/my-support/account',
    body: () => ({ confirmEmail: 'backer@saltmarsh.example' }),
  },
  {
    route: 'POST /api/orbit/spacecraft',
    as: () => engineer,
    url: () => '/api/orbit/spacecraft',
    body: () => ({ ...tern1Record, name: 'Tern-2', slug: 'tern-2', catalogNumber: '99902' }),
  },
  {
    route: 'PUT /api/orbit/spacecraft/:id',
    as: () => engineer,
    url: () => `/api/orbit/spacecraft/${craftId}`,
    body: () => ({ ...tern1Record }),
  },
  {
    route: 'POST /api/orbit/spacecraft/:id/sailing-periods',
    as: () => engineer,
    url: () => `/api/orbit/spacecraft/${craftId}/sailing-periods`,
    body: () => ({ startAt: '2026-01-10T00:00:00Z', endAt: '2026-01-11T00:00:00Z', mode: 'raising', note: 'from the log' }),
  },
  {
    route: 'PUT /api/orbit/sailing-periods/:periodId',
    as: () => engineer,
    url: () => `/api/orbit/sailing-periods/${periodId}`,
    body: () => ({ startAt: '2026-01-10T00:00:00Z', endAt: '2026-01-12T00:00:00Z', mode: 'edge-on', note: 'corrected' }),
  },
  {
    route: 'POST /api/orbit/snapshots',
    as: () => engineer,
    url: () => '/api/orbit/snapshots',
    body: () => ({
      spacecraftId: craftId,
      title: 'First raising period',
      caption: 'Apogee up.',
      fromMs: TERN1.startMs + 5 * DAY,
      toMs: TERN1.startMs + 25 * DAY,
      series: ['apogee', 'perigee'],
      annotations: [{ atMs: TERN1.startMs + 10 * DAY, text: 'Sail turned' }],
    }),
  },
  {
    route: 'PATCH /api/orbit/snapshots/:id',
    as: () => engineer,
    url: () => `/api/orbit/snapshots/${snapshotId}`,
    body: () => ({ title: 'Renamed', caption: 'Still apogee up.' }),
  },
  {
    route: 'POST /api/dispatches',
    as: () => outreach,
    url: () => '/api/dispatches',
    body: () => ({ title: 'Sail open', bodyMarkdown: 'It opened.', audience: { kind: 'everyone' }, heroAlt: 'The sail' }),
  },
  {
    route: 'POST /api/dispatches/preview',
    as: () => outreach,
    url: () => '/api/dispatches/preview',
    body: () => ({ markdown: 'It **opened**.' }),
  },
  {
    route: 'PUT /api/dispatches/:id',
    as: () => outreach,
    url: () => `/api/dispatches/${someUuid}`,
    body: () => ({ title: 'Sail open', bodyMarkdown: 'It opened.', audience: { kind: 'everyone' }, heroAlt: 'The sail' }),
  },
  {
    route: 'POST /api/books/pledges/:id/refunds',
    as: () => admin,
    url: () => `/api/books/pledges/${someUuid}/refunds`,
    body: () => ({ amountMinor: 100, reason: 'backer_asked', note: 'by phone' }),
  },
  {
    route: 'POST /api/books/findings/:id/resolve',
    as: () => admin,
    url: () => `/api/books/findings/${someUuid}/resolve`,
    body: () => ({ action: 'acknowledge', note: 'Checked by hand' }),
  },
  {
    route: 'PUT /api/books/settings',
    as: () => admin,
    url: () => '/api/books/settings',
    body: () => ({ organisationName: 'Saltmarsh Orbital Society', address: 'The harbour shed', registrationNumber: 'SOS-1' }),
  },
];

// Routes that take no JSON body (or a signed raw body, or a file): nothing of theirs reaches a text column.
const withoutJsonBody = new Set([
  'POST /api/auth/sign-out',
  'POST /api/auth/resend-verification',
  'DELETE /api/admin/accounts/:id/roles/:role',
  'POST /api/payments/webhook',
  'POST /api/pledges/:id/cancel',
  'DELETE /api/my-support/places/:id',
  'POST /api/my-support/memberships/:id/cancel',
  'POST /api/my-support/memberships/:id/resume',
  'POST /api/my-support/memberships/:id/card',
  'POST /api/orbit/spacecraft/:id/uploads',
  'POST /api/orbit/uploads/:jobId/import',
  'POST /api/orbit/uploads/:jobId/cancel',
  'DELETE /api/orbit/sailing-periods/:periodId',
  'DELETE /api/orbit/snapshots/:id',
  // No text in their bodies (ids, dates and enums only, each validated), or a file upload:
  'POST /api/admin/mail-queue/:id/retry',
  'PUT /api/my-support/places/reminders',
  'POST /api/books/reconciliations',
  'POST /api/books/months/:month/close',
  'POST /api/books/months/:month/publish',
  'POST /api/dispatches/:id/transition',
  'POST /api/dispatches/:id/hero',
  'DELETE /api/dispatches/:id/hero',
  'POST /api/dispatches/:id/email',
  'POST /api/dispatches/:id/retry',
  // One-click unsubscribe (RFC 8058): the signed token is in the query string, the body is the fixed form field.
  'POST /api/email-choices/unsubscribe',
  'POST /api/email-choices/resubscribe',
]);

/** Every string leaf of a JSON value, as a path and a setter on a copy. */
function stringLeaves(value: unknown, path: (string | number)[] = []): (string | number)[][] {
  if (typeof value === 'string') return [path];
  if (Array.isArray(value)) return value.flatMap((v, i) => stringLeaves(v, [...path, i]));
  if (value && typeof value === 'object') return Object.entries(value).flatMap(([k, v]) => stringLeaves(v, [...path, k]));
  return [];
}
function withLeaf(value: Record<string, unknown>, path: (string | number)[], leaf: string) {
  const copy = structuredClone(value);
  let at: Record<string | number, unknown> = copy;
  for (const key of path.slice(0, -1)) at = at[key] as Record<string | number, unknown>;
  at[path[path.length - 1]!] = leaf;
  return copy;
}

beforeAll(async () => {
  ({ t, engineer, spacecraftId: craftId } = await orbitDesk());
  outreach = await signedInAs(t, 'outreach');
  admin = await signedInAs(t, 'admin');
  backer = await signedInAs(t, 'backer');
  const { tier } = await insertCampaign(t);
  tierId = tier.patch.id;
  const history = simulateTern1({ days: 30 });
  const preview = await uploadAndPreview(engineer, craftId, formatTleFile(history.sets), 'tern-1.tle');
  await importUpload(engineer, preview.id);
  const period = await engineer
    .post(`/api/orbit/spacecraft/${craftId}/sailing-periods`)
    .set('x-csrf-token', engineer.csrf)
    .send({ startAt: '2026-01-01T00:00:00Z', endAt: '2026-01-02T00:00:00Z', mode: 'raising', note: 'seed' });
  expect(period.status, JSON.stringify(period.body)).toBe(201);
  periodId = period.body.sailingPeriod.id;
  const snap = await engineer
    .post('/api/orbit/snapshots')
    .set('x-csrf-token', engineer.csrf)
    .send(samples.find((s) => s.route === 'POST /api/orbit/snapshots')!.body());
  expect(snap.status, JSON.stringify(snap.body)).toBe(201);
  snapshotId = snap.body.snapshot.id;
}, 90_000);
afterAll(async () => t?.close());

describe('text with control characters or broken Unicode', () => {
  it('has a sample body for every route that takes JSON', () => {
    const served = routesOf(t.app)
      .filter((r) => r.method !== 'GET')
      .map((r) => `${r.method} ${r.path}`);
    const covered = new Set([...samples.map((s) => s.route), ...withoutJsonBody]);
    expect(served.filter((r) => !covered.has(r))).toEqual([]);
    // The table of routes used by the RBAC sweep lists the same routes.
    for (const s of samples) expect(rbacTable.map((r) => r.route)).toContain(s.route);
  });

  for (const sample of samples) {
    it(`${sample.route}: refused with 400 naming the field, never 500`, async () => {
      const base = sample.body();
      const leaves = stringLeaves(base);
      const failures: string[] = [];
      for (const leaf of leaves) {
        for (const bad of BAD) {
          const agent = await sample.as();
          const [method] = sample.route.split(' ') as [string];
          const m = method.toLowerCase() as 'post' | 'put' | 'patch' | 'delete';
          const res = await agent[m](sample.url())
            .set('x-csrf-token', agent.csrf)
            .send(withLeaf(base, leaf, bad.value));
          const field = `body.${leaf.join('.')}`;
          const paths = (res.body?.error?.details ?? []).map((d: { path: string }) => d.path);
          if (res.status !== 400 || !paths.includes(field)) {
            failures.push(`${field} with ${bad.name} → ${res.status} ${JSON.stringify(res.body).slice(0, 160)}`);
          }
        }
      }
      expect(failures).toEqual([]);
    });
  }

  it('refuses them in query strings too (admin search)', async () => {
    const res = await admin.get('/api/admin/accounts').query({ q: `back${NUL}er` });
    expect(res.status, JSON.stringify(res.body)).toBe(400);
    expect(res.body.error.details.map((d: { path: string }) => d.path)).toContain('query.q');
  });

  it('refuses them in every query string a GET route reads, and in path segments', async () => {
    const gets = rbacTable.filter((r) => r.route.startsWith('GET '));
    const failures: string[] = [];
    for (const row of gets) {
      const url = (row.sample ?? row.route.slice(4)).replace('00000000-0000-4000-8000-000000000000', craftId);
      const keys = ['q', 'from', 'to', 'sort', 'dir', 'spacecraftId', 'mine', 'limit', 'campaignId', 'returnTo'];
      await Promise.all(
        keys.map(async (key) => {
          const res = await admin
            .get(url)
            .query({ [key]: `x${NUL}y` })
            .redirects(0);
          // 502 is the processor's absence in this suite (the disputes list asks it live), not a text problem.
          if (res.status >= 500 && res.status !== 502) failures.push(`${url}?${key} → ${res.status}`);
        }),
      );
      const bent = url.replace(/\/([^/]+)$/, '/%00');
      const res = await admin.get(bent).redirects(0);
      if (res.status >= 500) failures.push(`${bent} → ${res.status}`);
    }
    expect(failures).toEqual([]);
  }, 120_000);

  it('refuses an upload whose file name or pasted text holds them, naming the part, and stores nothing', async () => {
    const before = await countRows(t, 'element_set_files');
    const content = tleLines([tern1Set(40, 900)]).join('\n');
    // A raw NUL in a multipart header is refused by the parser; the RFC 5987 form `filename*=` decodes to one.
    const boundary = 'lightkeel-test-boundary';
    const multipart = Buffer.from(
      `--${boundary}\r\nContent-Disposition: form-data; name="file"; filename*=UTF-8''sets%00.tle\r\n` +
        `Content-Type: text/plain\r\n\r\n${content}\r\n--${boundary}--\r\n`,
    );
    const named = await engineer
      .post(`/api/orbit/spacecraft/${craftId}/uploads`)
      .set('x-csrf-token', engineer.csrf)
      .set('content-type', `multipart/form-data; boundary=${boundary}`)
      .send(multipart);
    expect(named.status, JSON.stringify(named.body)).toBe(400);
    expect(
      named.body.error.details?.map((d: { path: string }) => d.path),
      JSON.stringify(named.body),
    ).toContain('file.name');
    for (const bad of BAD) {
      const raw = await upload(engineer, craftId, content, `sets${bad.value}.tle`);
      expect(raw.status, JSON.stringify(raw.body)).toBeLessThan(500);
      const pasted = await engineer
        .post(`/api/orbit/spacecraft/${craftId}/uploads`)
        .set('x-csrf-token', engineer.csrf)
        .field('text', content)
        .field('filename', `pasted${bad.value}.txt`);
      expect(pasted.status, JSON.stringify(pasted.body)).toBeLessThan(500);
      if (bad.value.includes(NUL)) {
        expect(pasted.status, JSON.stringify(pasted.body)).toBe(400);
        expect(pasted.body.error.details.map((d: { path: string }) => d.path)).toContain('body.filename');
      }
    }
    const nulText = await engineer
      .post(`/api/orbit/spacecraft/${craftId}/uploads`)
      .set('x-csrf-token', engineer.csrf)
      .field('text', `${content}\n${NUL}`);
    expect(nulText.status).toBeLessThan(500);
    const nulFile = await upload(engineer, craftId, Buffer.concat([Buffer.from(content), Buffer.from([0, 10])]), 'nul.tle');
    expect(nulFile.status).toBeLessThan(500);
    if (nulFile.status === 202) {
      await settle(engineer, nulFile.body.upload.id);
      // The preview may list the bad line; importing it must not fail either.
      const imported = await engineer
        .post(`/api/orbit/uploads/${nulFile.body.upload.id}/import`)
        .set('x-csrf-token', engineer.csrf)
        .send({});
      expect(imported.status).toBeLessThan(500);
    }
    expect(await countRows(t, 'element_set_files')).toBeLessThanOrEqual(before + 1);
  });

  it('keeps every record unchanged after the sweep: nothing was half-written', async () => {
    const { rows } = await t.database.pool.query(
      `select (select count(*) from spacecraft)::int as craft, (select count(*) from tiers)::int as tiers,
              (select title from campaigns where slug = 'tern-1') as title,
              (select display_name from accounts where email = 'backer@saltmarsh.example') as backer`,
    );
    expect(rows[0]).toEqual({ craft: 1, tiers: 3, title: 'Tern-1 sail test campaign', backer: 'Wren Dunlin' });
  });
});
