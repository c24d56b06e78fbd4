import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Agent, TestApp } from '../setup/test-app';
import { formatTleFile } from '../../shared/orbit/tle-write';
import { importUpload, orbitDesk, tern1Record, tern1Set, uploadAndPreview } from './orbit-helpers';

let t: TestApp;
let engineer: Agent;
let tern1Id: string;

beforeAll(async () => {
  ({ t, engineer, spacecraftId: tern1Id } = await orbitDesk());
}, 60_000);
afterAll(async () => t.close());

// A comparison object: a catalogued reference satellite in a similar orbit, no sail (values made up for the test).
const reference = {
  name: 'Aardvark reference sat',
  slug: 'aardvark-ref',
  catalogNumber: '41001',
  internationalDesignator: '15077B',
  massKg: 130,
  dragCoefficient: 2.2,
  dragAreaEdgeOnM2: 0.9,
};

const create = (body: object) => engineer.post('/api/orbit/spacecraft').set('x-csrf-token', engineer.csrf).send(body);

describe('the mission craft', () => {
  it('is the first craft recorded, and stays first in the list when a comparison object sorts before it', async () => {
    const res = await create(reference);
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    expect(res.body.spacecraft.isMissionCraft).toBe(false);
    const list = await engineer.get('/api/orbit/spacecraft').expect(200);
    // "Aardvark…" sorts before "Tern-1" by name; the mission craft still comes first.
    expect(list.body.spacecraft.map((c: { name: string; isMissionCraft: boolean }) => [c.name, c.isMissionCraft])).toEqual([
      ['Tern-1', true],
      ['Aardvark reference sat', false],
    ]);
  });

  it('is the default of the public orbit summary and of a snapshot saved without a craft', async () => {
    const pub = await engineer.get('/api/public/orbit').expect(200);
    expect(pub.body.spacecraft.slug).toBe('tern-1');
    const snap = await engineer
      .post('/api/orbit/snapshots')
      .set('x-csrf-token', engineer.csrf)
      .send({ title: 'Default craft', fromMs: Date.UTC(2026, 0, 1), toMs: Date.UTC(2026, 1, 1), series: ['apogee'] });
    expect(snap.status, JSON.stringify(snap.body)).toBe(201);
    expect(snap.body.snapshot.spacecraftId).toBe(tern1Id);
  });

  it('moves when another craft is marked: one mission craft at a time', async () => {
    const list = await engineer.get('/api/orbit/spacecraft').expect(200);
    const ref = list.body.spacecraft.find((c: { slug: string }) => c.slug === 'aardvark-ref');
    const res = await engineer
      .put(`/api/orbit/spacecraft/${ref.id}`)
      .set('x-csrf-token', engineer.csrf)
      .send({ ...reference, isMissionCraft: true });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    const { rows } = await t.database.pool.query('select slug from spacecraft where is_mission_craft');
    expect(rows).toEqual([{ slug: 'aardvark-ref' }]);
    expect((await engineer.get('/api/public/orbit').expect(200)).body.spacecraft.slug).toBe('aardvark-ref');
    // Back to Tern-1, and the database refuses a second mark made behind the service's back.
    await engineer
      .put(`/api/orbit/spacecraft/${tern1Id}`)
      .set('x-csrf-token', engineer.csrf)
      .send({ ...tern1Record, isMissionCraft: true })
      .expect(200);
    await expect(t.database.pool.query('update spacecraft set is_mission_craft = true')).rejects.toMatchObject({
      code: '23505',
      constraint: 'spacecraft_one_mission_craft',
    });
  });
});

describe('a craft without a sail', () => {
  it('is recordable with sail area 0 or with no sail fields at all, and a negative area is refused', async () => {
    const zero = await create({ ...reference, name: 'Zero sail', slug: 'zero-sail', catalogNumber: '41002', sailAreaM2: 0 });
    expect(zero.status, JSON.stringify(zero.body)).toBe(201);
    expect(zero.body.spacecraft).toMatchObject({ sailAreaM2: 0, hasSail: false, isMissionCraft: false });
    const empty = await create({ ...reference, name: 'Empty sail', slug: 'empty-sail', catalogNumber: '41003', sailAreaM2: '' });
    expect(empty.status, JSON.stringify(empty.body)).toBe(201);
    expect(empty.body.spacecraft.sailAreaM2).toBe(0);
    const negative = await create({ ...reference, name: 'Bad', slug: 'bad', catalogNumber: '41004', sailAreaM2: -1 });
    expect(negative.status).toBe(400);
    expect(negative.body.error.details).toEqual([{ path: 'body.sailAreaM2', message: 'must be 0 m² (no sail) or more' }]);
  });

  it('has a sail yield that says the sail does not apply, and a drag-only lifetime', async () => {
    const list = await engineer.get('/api/orbit/spacecraft').expect(200);
    const ref = list.body.spacecraft.find((c: { slug: string }) => c.slug === 'aardvark-ref');
    // Its own element sets (Tern-1's orbit under the reference's catalog number).
    const sets = Array.from({ length: 12 }, (_, i) => ({
      ...tern1Set(i, i + 1),
      catalogNumber: '41001',
      catalogNumberInt: 41001,
      internationalDesignator: '15077B',
    }));
    const preview = await uploadAndPreview(engineer, ref.id, formatTleFile(sets, { withNames: false }), 'ref.tle');
    expect(preview.counts.new).toBe(12);
    await importUpload(engineer, preview.id);
    const res = await engineer.get(`/api/orbit/spacecraft/${ref.id}/sail-yield`).expect(200);
    expect(res.body.sailApplies).toBe(false);
    expect(res.body.comparison).toBeNull();
    expect(res.body.model).toBeNull();
    expect(res.body.lifetime.basis).toBe('drag only, no sail');
    // 130 kg behind 0.9 m² near 500 km: the drag-only estimate runs past the 100-year horizon or gives a date.
    const mean = res.body.lifetime.mean as { days: number | null; exceedsHorizon: boolean };
    expect(mean.exceedsHorizon || (mean.days ?? 0) > 0).toBe(true);
    // The mission craft's panel keeps its sail figures.
    const tern = await engineer.get(`/api/orbit/spacecraft/${tern1Id}/sail-yield`).expect(200);
    expect(tern.body.sailApplies).toBe(true);
  });
});
