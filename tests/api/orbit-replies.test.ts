// The orbit desk's answers, as the server really sends them, parsed with the one definition of their shapes
// (shared/schemas/orbit-replies.ts) that the client's types are. Strict objects: a field the server adds, renames or
// drops without the shared definition following fails here, before the client reads it wrong.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import type { z } from 'zod';
import type { Agent, TestApp } from '../setup/test-app';
import { orbitReplies } from '../../shared/schemas/orbit-replies';
import { formatTleFile } from '../../shared/orbit/tle-write';
import { simulateTern1, TERN1 } from '../../shared/orbit/simulate';
import { importUpload, orbitDesk, signedInAs, uploadAndPreview } from './orbit-helpers';

const DAY = 86_400_000;
let t: TestApp;
let engineer: Agent;
let craftId: string;
const history = simulateTern1();

function expectShape<S extends z.ZodType>(schema: S, body: unknown, what: string): z.infer<S> {
  const parsed = schema.safeParse(body);
  if (!parsed.success) throw new Error(`${what} left its shared shape:\n${JSON.stringify(parsed.error.issues.slice(0, 5), null, 2)}`);
  return parsed.data;
}

beforeAll(async () => {
  ({ t, engineer, spacecraftId: craftId } = await orbitDesk());
  const preview = await uploadAndPreview(engineer, craftId, formatTleFile(history.sets, { withNames: true }), 'tern-1.tle');
  await importUpload(engineer, preview.id);
  for (const p of history.periods) {
    await engineer
      .post(`/api/orbit/spacecraft/${craftId}/sailing-periods`)
      .set('x-csrf-token', engineer.csrf)
      .send({ startAt: new Date(p.startMs).toISOString(), endAt: new Date(p.endMs).toISOString(), mode: p.mode, note: '' })
      .expect(201);
  }
}, 90_000);
afterAll(async () => t.close());

describe('the orbit desk answers in the shapes shared with the client', () => {
  it('spacecraft: the list, one craft, a new craft without a sail', async () => {
    const list = expectShape(
      orbitReplies.spacecraftList,
      (await engineer.get('/api/orbit/spacecraft').expect(200)).body,
      'spacecraft list',
    );
    expect(list.spacecraft.map((c) => c.slug)).toContain('tern-1');
    const one = expectShape(
      orbitReplies.spacecraft,
      (await engineer.get(`/api/orbit/spacecraft/${craftId}`).expect(200)).body,
      'spacecraft',
    );
    expect(one.spacecraft).toMatchObject({ catalogNumber: TERN1.catalogNumber, hasSail: true, launchDate: '2025-10-08' });
    const created = await engineer
      .post('/api/orbit/spacecraft')
      .set('x-csrf-token', engineer.csrf)
      .send({ name: 'Reply reference', slug: 'reply-ref', catalogNumber: '99702', massKg: 30, dragCoefficient: 2.2, dragAreaEdgeOnM2: 0.3 })
      .expect(201);
    expect(expectShape(orbitReplies.spacecraft, created.body, 'new spacecraft').spacecraft).toMatchObject({
      hasSail: false,
      sailAreaM2: 0,
    });
  });

  it('uploads: a preview with a damaged line and a set of another object, and the files list', async () => {
    const lines = formatTleFile(history.sets.slice(0, 3)).trimEnd().split('\n');
    lines[1] = lines[1]!.slice(0, 20) + 'xx' + lines[1]!.slice(22);
    const other = formatTleFile([{ ...history.sets[5]!, catalogNumber: '99703', catalogNumberInt: 99703, name: 'OTHER' }], {
      withNames: true,
    });
    const preview = await uploadAndPreview(engineer, craftId, lines.join('\n') + '\n' + other, 'mixed.tle');
    const job = expectShape(orbitReplies.upload, { upload: preview }, 'upload').upload;
    expect(job.status).toBe('previewed');
    expect(job.errors.length).toBeGreaterThanOrEqual(1);
    expect(job.errors.some((e) => e.columns !== undefined)).toBe(true);
    const again = expectShape(orbitReplies.upload, (await engineer.get(`/api/orbit/uploads/${preview.id}`).expect(200)).body, 'upload');
    expect(again.upload.id).toBe(preview.id);
    const files = expectShape(orbitReplies.files, (await engineer.get(`/api/orbit/spacecraft/${craftId}/files`).expect(200)).body, 'files');
    expect(files.files[0]!.filename).toBe('tern-1.tle');
  });

  it('history: a page of stored sets', async () => {
    const res = await engineer.get(`/api/orbit/spacecraft/${craftId}/element-sets`).query({ pageSize: 20 }).expect(200);
    const page = expectShape(orbitReplies.history, res.body, 'history page');
    expect(page.rows).toHaveLength(20);
    expect(page.total).toBe(history.sets.length - TERN1.duplicateDays.length);
  });

  it('trend: the whole history reduced per column, and a zoomed view at full resolution', async () => {
    const whole = expectShape(
      orbitReplies.trend,
      (await engineer.get(`/api/orbit/spacecraft/${craftId}/trend`).query({ columns: 100 }).expect(200)).body,
      'trend',
    );
    expect(whole.view.reduced).toBe(true);
    expect(whole.rates).not.toBeNull();
    expect(whole.sailingPeriods).toHaveLength(history.periods.length);
    const zoomed = await engineer
      .get(`/api/orbit/spacecraft/${craftId}/trend`)
      .query({
        viewFrom: new Date(TERN1.startMs + 100 * DAY).toISOString(),
        viewTo: new Date(TERN1.startMs + 110 * DAY).toISOString(),
      })
      .expect(200);
    expect(expectShape(orbitReplies.trend, zoomed.body, 'zoomed trend').view.reduced).toBe(false);
  });

  it('sail yield: a sail craft with its periods, a craft without a sail, a craft without sets', async () => {
    const sail = expectShape(
      orbitReplies.sailYield,
      (await engineer.get(`/api/orbit/spacecraft/${craftId}/sail-yield`).expect(200)).body,
      'sail yield',
    );
    expect(sail.sailApplies).toBe(true);
    expect(sail.model?.byActivity.map((a) => a.activity)).toEqual(['low', 'mean', 'high']);
    expect(sail.lifetime?.basis).toBe('sail edge-on, drag only');
    const list = (await engineer.get('/api/orbit/spacecraft').expect(200)).body.spacecraft as { id: string; slug: string }[];
    const bare = list.find((c) => c.slug === 'reply-ref')!;
    const empty = expectShape(
      orbitReplies.sailYield,
      (await engineer.get(`/api/orbit/spacecraft/${bare.id}/sail-yield`).expect(200)).body,
      'sail yield without sets',
    );
    expect(empty).toMatchObject({ sailApplies: false, model: null, lifetime: null });
  });

  it('sailing periods: the log and one saved period', async () => {
    const log = expectShape(
      orbitReplies.sailingPeriods,
      (await engineer.get(`/api/orbit/spacecraft/${craftId}/sailing-periods`).expect(200)).body,
      'sailing periods',
    );
    expect(log.sailingPeriods).toHaveLength(history.periods.length);
    const end = TERN1.startMs + (TERN1.days + 10) * DAY;
    const saved = await engineer
      .post(`/api/orbit/spacecraft/${craftId}/sailing-periods`)
      .set('x-csrf-token', engineer.csrf)
      .send({ startAt: new Date(end).toISOString(), endAt: new Date(end + DAY).toISOString(), mode: 'tumbling', note: 'after the history' })
      .expect(201);
    expect(expectShape(orbitReplies.sailingPeriod, saved.body, 'sailing period').sailingPeriod.mode).toBe('tumbling');
  });

  it('snapshots: saved, listed, opened, and published', async () => {
    const endMs = TERN1.startMs + TERN1.days * DAY;
    const created = await engineer
      .post('/api/orbit/snapshots')
      .set('x-csrf-token', engineer.csrf)
      .send({
        spacecraftId: craftId,
        title: 'Reply shapes',
        caption: 'Checked against the shared definition.',
        fromMs: endMs - 60 * DAY,
        toMs: endMs,
        rateFromMs: endMs - 30 * DAY,
        rateToMs: endMs,
        series: ['apogee', 'perigee'],
        annotations: [{ atMs: endMs - 10 * DAY, text: 'A note' }],
        isPublic: true,
      })
      .expect(201);
    const snap = expectShape(orbitReplies.snapshot, created.body, 'new snapshot').snapshot;
    expect(snap.data.series).toEqual(['apogee', 'perigee']);
    const outreach = await signedInAs(t, 'outreach');
    const list = expectShape(orbitReplies.snapshotList, (await outreach.get('/api/orbit/snapshots').expect(200)).body, 'snapshot list');
    expect(list.snapshots.map((s) => s.id)).toContain(snap.id);
    expectShape(orbitReplies.snapshot, (await outreach.get(`/api/orbit/snapshots/${snap.id}`).expect(200)).body, 'snapshot');
    const pub = expectShape(
      orbitReplies.publicSnapshot,
      (await request(t.app).get(`/api/public/snapshots/${snap.slug}`).expect(200)).body,
      'public',
    );
    expect(pub.snapshot.title).toBe('Reply shapes');
  });

  it('refuses an answer that drifted: a renamed, a dropped or an added field', async () => {
    const body = (await engineer.get(`/api/orbit/spacecraft/${craftId}`).expect(200)).body as { spacecraft: Record<string, unknown> };
    expect(orbitReplies.spacecraft.safeParse(body).success).toBe(true);
    const { massKg, ...rest } = body.spacecraft;
    expect(orbitReplies.spacecraft.safeParse({ spacecraft: { ...rest, massKG: massKg } }).success).toBe(false);
    expect(orbitReplies.spacecraft.safeParse({ spacecraft: rest }).success).toBe(false);
    expect(orbitReplies.spacecraft.safeParse({ spacecraft: { ...body.spacecraft, colour: 'amber' } }).success).toBe(false);
    // A number that did not survive JSON (NaN is sent as null) is caught too.
    expect(orbitReplies.spacecraft.safeParse({ spacecraft: { ...body.spacecraft, massKg: null } }).success).toBe(false);
  });
});
