import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Agent, TestApp } from '../setup/test-app';
import { trimToFree } from '../../shared/orbit/period-overlap';
import { countRows, orbitDesk } from './orbit-helpers';

let t: TestApp;
let engineer: Agent;
let craftId: string;

beforeAll(async () => {
  ({ t, engineer, spacecraftId: craftId } = await orbitDesk());
}, 60_000);
afterAll(async () => t.close());

const post = (body: object) =>
  engineer
    .post(`/api/orbit/spacecraft/${craftId}/sailing-periods`)
    .set('x-csrf-token', engineer.csrf)
    .send({ note: '', ...body });

describe('sailing periods cannot overlap', () => {
  it('refuses an edge-on period overlapping a raising one, names the raising period and offers the trim that fits', async () => {
    const raising = await post({ startAt: '2026-02-01T00:00:00Z', endAt: '2026-02-10T00:00:00Z', mode: 'raising' });
    expect(raising.status).toBe(201);
    const before = await countRows(t, 'sailing_periods');

    const res = await post({ startAt: '2026-02-08T00:00:00Z', endAt: '2026-02-15T00:00:00Z', mode: 'edge-on' });
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('orbit.sailing_period_overlap');
    expect(res.body.error.message).toBe(
      'This period overlaps the raising period 2026-02-01 00:00 UTC – 2026-02-10 00:00 UTC. ' +
        'Trim this period to 2026-02-10 00:00 UTC – 2026-02-15 00:00 UTC, or change the raising period first.',
    );
    expect(res.body.error.details).toEqual([
      { path: 'startAt', message: 'overlaps the raising period 2026-02-01 00:00 UTC – 2026-02-10 00:00 UTC' },
    ]);
    expect(await countRows(t, 'sailing_periods')).toBe(before);

    // Taking the offer: touching the raising period is allowed (half-open spans).
    const trimmed = await post({ startAt: '2026-02-10T00:00:00Z', endAt: '2026-02-15T00:00:00Z', mode: 'edge-on' });
    expect(trimmed.status).toBe(201);
  });

  it('says when no part of the period is free', async () => {
    const res = await post({ startAt: '2026-02-02T00:00:00Z', endAt: '2026-02-03T00:00:00Z', mode: 'tumbling' });
    expect(res.status).toBe(409);
    expect(res.body.error.message).toMatch(/No part of this period is free: change or delete the raising period first\.$/);
  });

  it('refuses an edit that would stretch a period over its neighbour, and keeps the period as it was', async () => {
    const list = await engineer.get(`/api/orbit/spacecraft/${craftId}/sailing-periods`).expect(200);
    const edgeOn = list.body.sailingPeriods.find((p: { mode: string }) => p.mode === 'edge-on');
    const res = await engineer
      .put(`/api/orbit/sailing-periods/${edgeOn.id}`)
      .set('x-csrf-token', engineer.csrf)
      .send({ startAt: '2026-02-05T00:00:00Z', endAt: '2026-02-15T00:00:00Z', mode: 'edge-on', note: '' });
    expect(res.status).toBe(409);
    expect(res.body.error.message).toMatch(/^This period overlaps the raising period 2026-02-01 00:00 UTC – 2026-02-10 00:00 UTC\./);
    const after = await engineer.get(`/api/orbit/spacecraft/${craftId}/sailing-periods`).expect(200);
    expect(after.body.sailingPeriods.find((p: { id: string }) => p.id === edgeOn.id).startAt).toBe('2026-02-10T00:00:00.000Z');
    // Its own old span is not "another period": moving within itself is fine.
    const own = await engineer
      .put(`/api/orbit/sailing-periods/${edgeOn.id}`)
      .set('x-csrf-token', engineer.csrf)
      .send({ startAt: '2026-02-11T00:00:00Z', endAt: '2026-02-16T00:00:00Z', mode: 'edge-on', note: 'moved' });
    expect(own.status).toBe(200);
  });

  it('lets exactly one of two concurrent overlapping saves through', async () => {
    const before = await countRows(t, 'sailing_periods');
    const [a, b] = await Promise.all([
      post({ startAt: '2026-03-01T00:00:00Z', endAt: '2026-03-10T00:00:00Z', mode: 'raising' }),
      post({ startAt: '2026-03-05T00:00:00Z', endAt: '2026-03-12T00:00:00Z', mode: 'edge-on' }),
    ]);
    expect([a.status, b.status].sort()).toEqual([201, 409]);
    const loser = a.status === 409 ? a : b;
    expect(loser.body.error.code).toBe('orbit.sailing_period_overlap');
    expect(await countRows(t, 'sailing_periods')).toBe(before + 1);
  });

  it('holds in the database itself, not only in the service', async () => {
    await expect(
      t.database.pool.query(
        `insert into sailing_periods (spacecraft_id, start_at, end_at, mode) values ($1, '2026-02-03', '2026-02-04', 'unknown')`,
        [craftId],
      ),
    ).rejects.toMatchObject({ code: '23P01', constraint: 'sailing_periods_no_overlap' });
  });
});

describe('the trim offer', () => {
  it('keeps the longest free part of the requested span', () => {
    const day = 86_400_000;
    expect(trimToFree({ startMs: 0, endMs: 10 * day }, [{ startMs: 2 * day, endMs: 3 * day }])).toEqual({
      startMs: 3 * day,
      endMs: 10 * day,
    });
    expect(trimToFree({ startMs: 0, endMs: 4 * day }, [{ startMs: 0, endMs: 5 * day }])).toBeNull();
    expect(trimToFree({ startMs: 0, endMs: 4 * day }, [{ startMs: 4 * day, endMs: 5 * day }])).toEqual({ startMs: 0, endMs: 4 * day });
  });
});
