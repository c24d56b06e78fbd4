import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import type { Agent, TestApp } from '../setup/test-app';
import { formatTleFile } from '../../shared/orbit/tle-write';
import { simulateTern1, TERN1 } from '../../shared/orbit/simulate';
import { importUpload, orbitDesk, signedInAs, uploadAndPreview } from './orbit-helpers';

const DAY = 86_400_000;
let t: TestApp;
let engineer: Agent;
let craftId: string;
const history = simulateTern1({ days: 120 });

beforeAll(async () => {
  ({ t, engineer, spacecraftId: craftId } = await orbitDesk());
  const preview = await uploadAndPreview(engineer, craftId, formatTleFile(history.sets), 'tern-1.tle');
  await importUpload(engineer, preview.id);
  for (const p of history.periods) {
    await engineer
      .post(`/api/orbit/spacecraft/${craftId}/sailing-periods`)
      .set('x-csrf-token', engineer.csrf)
      .send({ startAt: new Date(p.startMs).toISOString(), endAt: new Date(p.endMs).toISOString(), mode: p.mode, note: 'from the log' })
      .expect(201);
  }
}, 60_000);
afterAll(async () => t.close());

const fromMs = TERN1.startMs + 40 * DAY,
  toMs = TERN1.startMs + 110 * DAY;

async function createSnapshot(over: Record<string, unknown> = {}) {
  const res = await engineer
    .post('/api/orbit/snapshots')
    .set('x-csrf-token', engineer.csrf)
    .send({
      spacecraftId: craftId,
      title: 'First raising period',
      caption: 'Apogee up, perigee down.',
      fromMs,
      toMs,
      rateFromMs: TERN1.startMs + 60 * DAY,
      rateToMs: TERN1.startMs + 90 * DAY,
      series: ['apogee', 'perigee'],
      annotations: [{ atMs: TERN1.startMs + 58 * DAY, text: 'Sail turned to raise' }],
      ...over,
    });
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  return res.body.snapshot;
}

describe('chart snapshots', () => {
  it('freezes the window, series, periods, rates and notes', async () => {
    const s = await createSnapshot();
    const res = await engineer.get(`/api/orbit/snapshots/${s.id}`).expect(200);
    const data = res.body.snapshot.data;
    expect(data.series).toEqual(['apogee', 'perigee']);
    expect(data.points.epochMs.length).toBeGreaterThan(150);
    expect(Math.min(...data.points.epochMs)).toBeGreaterThanOrEqual(fromMs);
    expect(Math.max(...data.points.epochMs)).toBeLessThanOrEqual(toMs);
    expect(data.points.values.apogee).toHaveLength(data.points.epochMs.length);
    expect(data.sailingPeriods.map((p: { mode: string }) => p.mode)).toContain('raising');
    expect(data.rateLines.apogee.slopePerDay).toBeGreaterThan(0);
    expect(data.annotations[0].text).toBe('Sail turned to raise');
    // The frozen data does not move when the history changes later.
    // (Periods may not overlap: the log's period at the window's start is changed instead of adding one over it.)
    const log = await engineer.get(`/api/orbit/spacecraft/${craftId}/sailing-periods`).expect(200);
    const atStart = log.body.sailingPeriods.find(
      (p: { startAt: string; endAt: string }) => Date.parse(p.startAt) <= fromMs && Date.parse(p.endAt) > fromMs,
    );
    await engineer
      .put(`/api/orbit/sailing-periods/${atStart.id}`)
      .set('x-csrf-token', engineer.csrf)
      .send({ startAt: atStart.startAt, endAt: atStart.endAt, mode: 'tumbling' })
      .expect(200);
    const again = await engineer.get(`/api/orbit/snapshots/${s.id}`).expect(200);
    expect(again.body.snapshot.data.sailingPeriods).toEqual(data.sailingPeriods);
  });

  it('renders as SVG holding each series and as a PNG', async () => {
    const s = await createSnapshot();
    const svg = await engineer
      .get(`/api/orbit/snapshots/${s.id}/chart.svg`)
      .buffer(true)
      .parse((res, cb) => {
        let body = '';
        res.on('data', (c: Buffer) => (body += c.toString()));
        res.on('end', () => cb(null, body));
      });
    expect(svg.status).toBe(200);
    expect(svg.headers['content-type']).toMatch(/image\/svg\+xml/);
    const text = svg.body as string;
    expect(text.startsWith('<svg')).toBe(true);
    expect(text).toContain('data-series="apogee"');
    expect(text).toContain('data-series="perigee"');
    expect(text).not.toContain('data-series="energy"');
    expect(text).toContain('First raising period');
    expect(text).toContain('Sail turned to raise');
    expect(text).toMatch(/\+\d+\.\d+ km\/day/);
    const png = await engineer
      .get(`/api/orbit/snapshots/${s.id}/chart.png`)
      .buffer(true)
      .parse((res, cb) => {
        const chunks: Buffer[] = [];
        res.on('data', (c: Buffer) => chunks.push(c));
        res.on('end', () => cb(null, Buffer.concat(chunks)));
      });
    expect(png.status).toBe(200);
    const bytes = png.body as Buffer;
    expect([...bytes.subarray(0, 8)]).toEqual([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]);
    // IHDR width: twice the 960 px SVG.
    expect(bytes.readUInt32BE(16)).toBe(1920);
  });

  it('publishes at a stable link that survives a rename, and hides it again when made private', async () => {
    const s = await createSnapshot();
    const anon = request(t.app);
    expect((await anon.get(`/api/public/snapshots/${s.slug}`)).status).toBe(404);
    const pub = await engineer
      .patch(`/api/orbit/snapshots/${s.id}`)
      .set('x-csrf-token', engineer.csrf)
      .send({ isPublic: true, title: 'Renamed' });
    expect(pub.status).toBe(200);
    expect(pub.body.snapshot.slug).toBe(s.slug);
    const open = await anon.get(`/api/public/snapshots/${s.slug}`).expect(200);
    expect(open.body.snapshot.title).toBe('Renamed');
    expect((await anon.get(`/api/public/snapshots/${s.slug}.svg`)).status).toBe(200);
    expect((await anon.get(`/api/public/snapshots/${s.slug}.png`)).headers['content-type']).toBe('image/png');
    await engineer.patch(`/api/orbit/snapshots/${s.id}`).set('x-csrf-token', engineer.csrf).send({ isPublic: false }).expect(200);
    expect((await anon.get(`/api/public/snapshots/${s.slug}.svg`)).status).toBe(404);
  });

  it('lets outreach read snapshots but only their owner or an admin change them', async () => {
    const s = await createSnapshot({ title: 'Owned' });
    const outreach = await signedInAs(t, 'outreach');
    const list = await outreach.get('/api/orbit/snapshots').expect(200);
    expect(list.body.snapshots.map((x: { id: string }) => x.id)).toContain(s.id);
    expect((await outreach.get(`/api/orbit/snapshots/${s.id}/chart.png`)).status).toBe(200);
    expect((await outreach.delete(`/api/orbit/snapshots/${s.id}`).set('x-csrf-token', outreach.csrf)).status).toBe(403);
    const admin = await signedInAs(t, 'admin');
    const mine = await admin.get('/api/orbit/snapshots?mine=true').expect(200);
    expect(mine.body.snapshots).toEqual([]);
    expect((await engineer.delete(`/api/orbit/snapshots/${s.id}`).set('x-csrf-token', engineer.csrf)).status).toBe(204);
    expect((await engineer.get(`/api/orbit/snapshots/${s.id}`)).status).toBe(404);
  });

  it('refuses a snapshot with three kinds of series, or an empty window', async () => {
    const three = await engineer
      .post('/api/orbit/snapshots')
      .set('x-csrf-token', engineer.csrf)
      .send({ spacecraftId: craftId, title: 'x', fromMs, toMs, series: ['apogee', 'semiMajorAxis', 'energy'] });
    expect(three.status).toBe(400);
    expect(three.body.error.details[0].path).toBe('body.series');
    const empty = await engineer
      .post('/api/orbit/snapshots')
      .set('x-csrf-token', engineer.csrf)
      .send({ spacecraftId: craftId, title: 'x', fromMs: toMs, toMs: fromMs, series: ['apogee'] });
    expect(empty.status).toBe(400);
  });
});

describe('the sailing-period log', () => {
  it('records, changes and removes periods, refusing an end before the start', async () => {
    const base = `/api/orbit/spacecraft/${craftId}/sailing-periods`;
    const created = await engineer
      .post(base)
      .set('x-csrf-token', engineer.csrf)
      .send({ startAt: '2030-02-01T00:00:00Z', endAt: '2030-02-10T00:00:00Z', mode: 'raising', note: 'test' });
    expect(created.status).toBe(201);
    const id = created.body.sailingPeriod.id;
    const bad = await engineer
      .put(`/api/orbit/sailing-periods/${id}`)
      .set('x-csrf-token', engineer.csrf)
      .send({ startAt: '2030-02-10T00:00:00Z', endAt: '2030-02-01T00:00:00Z', mode: 'raising' });
    expect(bad.status).toBe(400);
    expect(bad.body.error.details[0].path).toBe('body.endAt');
    const changed = await engineer
      .put(`/api/orbit/sailing-periods/${id}`)
      .set('x-csrf-token', engineer.csrf)
      .send({ startAt: '2030-02-01T00:00:00Z', endAt: '2030-02-12T00:00:00Z', mode: 'edge-on', note: 'feathered' });
    expect(changed.body.sailingPeriod).toMatchObject({ mode: 'edge-on', note: 'feathered', endAt: '2030-02-12T00:00:00.000Z' });
    expect((await engineer.delete(`/api/orbit/sailing-periods/${id}`).set('x-csrf-token', engineer.csrf)).status).toBe(204);
    expect((await engineer.delete(`/api/orbit/sailing-periods/${id}`).set('x-csrf-token', engineer.csrf)).status).toBe(404);
    const { rows } = await t.database.pool.query('select action from audit_log where subject_id = $1 order by id', [id]);
    expect(rows.map((r) => r.action)).toEqual(['sailing_period.created', 'sailing_period.updated', 'sailing_period.deleted']);
  });
});

describe('spacecraft records', () => {
  it('validates the record and keeps catalog numbers unique', async () => {
    const bad = await engineer.post('/api/orbit/spacecraft').set('x-csrf-token', engineer.csrf).send({
      name: '',
      slug: 'Bad Slug',
      catalogNumber: 'x',
      massKg: -1,
      sailAreaM2: 1,
      sailReflectivity: 2,
      dragCoefficient: 2.2,
      dragAreaEdgeOnM2: 1,
    });
    expect(bad.status).toBe(400);
    const paths = bad.body.error.details.map((d: { path: string }) => d.path);
    expect(paths).toEqual(expect.arrayContaining(['body.name', 'body.slug', 'body.catalogNumber', 'body.massKg', 'body.sailReflectivity']));
    const dup = await engineer.post('/api/orbit/spacecraft').set('x-csrf-token', engineer.csrf).send({
      name: 'Copy',
      slug: 'copy',
      catalogNumber: TERN1.catalogNumber,
      massKg: 1,
      sailAreaM2: 1,
      sailReflectivity: 0.5,
      dragCoefficient: 2.2,
      dragAreaEdgeOnM2: 1,
    });
    expect(dup.status).toBe(409);
    expect(dup.body.error.code).toBe('orbit.spacecraft_catalog_taken');
  });
});

describe('the audit log of snapshot edits', () => {
  it('records only the title on a rename, and nothing for a save that changes nothing', async () => {
    const s = await createSnapshot({ title: 'Before the rename' });
    const entries = async () =>
      (await t.database.pool.query('select action, before, after from audit_log where subject_id = $1 order by id', [s.id])).rows;
    await engineer.patch(`/api/orbit/snapshots/${s.id}`).set('x-csrf-token', engineer.csrf).send({ title: 'After the rename' }).expect(200);
    const [, renamed] = await entries();
    expect(renamed).toEqual({ action: 'snapshot.updated', before: { title: 'Before the rename' }, after: { title: 'After the rename' } });
    const res = await engineer.get(`/api/orbit/snapshots/${s.id}`).expect(200);
    expect(res.body.snapshot).toMatchObject({ caption: 'Apogee up, perigee down.', isPublic: false });

    await engineer
      .patch(`/api/orbit/snapshots/${s.id}`)
      .set('x-csrf-token', engineer.csrf)
      .send({ title: 'After the rename', caption: 'Apogee up, perigee down.' })
      .expect(200);
    expect(await entries()).toHaveLength(2);
  });
});
