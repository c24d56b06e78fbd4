import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Agent, TestApp } from '../setup/test-app';
import { formatTleFile } from '../../shared/orbit/tle-write';
import { MU_WGS72_KM3_PER_S2 } from '../../shared/orbit/constants';
import { importUpload, orbitDesk, tern1Set, uploadAndPreview } from './orbit-helpers';

let t: TestApp;
let engineer: Agent;
let craftId: string;

beforeAll(async () => {
  ({ t, engineer, spacecraftId: craftId } = await orbitDesk());
}, 60_000);
afterAll(async () => t.close());

// 200 days of sets, two a day; mean motion falls faster in days 100–160 (the craft climbs more while raising).
const sets = Array.from({ length: 400 }, (_, i) => {
  const day = i / 2;
  const climb = day < 100 ? 0 : day < 160 ? (day - 100) * 4e-5 : 60 * 4e-5;
  return tern1Set(day, i + 1, { meanMotionRevPerDay: 14.3266 - day * 1e-5 - climb });
});

describe('the public orbit summary on the mission page', () => {
  it('carries at most 60 averaged points of the whole history for the small trend chart', async () => {
    const preview = await uploadAndPreview(engineer, craftId, formatTleFile(sets));
    expect(preview.counts.new).toBe(400);
    await importUpload(engineer, preview.id);
    const res = await engineer.get('/api/public/orbit').expect(200);
    const trend = res.body.trend as Array<{ epochMs: number; apogeeKm: number; perigeeKm: number; sets: number }>;
    expect(trend.length).toBe(60);
    expect(trend.reduce((s, p) => s + p.sets, 0)).toBe(400);
    // Averages: the first bucket's epoch lies inside its sets' span and the series runs in time order.
    const first = sets[0]!.epochMs;
    expect(trend[0]!.epochMs).toBeGreaterThanOrEqual(first);
    expect(trend[0]!.epochMs).toBeLessThan(first + 4 * 86_400_000);
    for (let i = 1; i < trend.length; i++) expect(trend[i]!.epochMs).toBeGreaterThan(trend[i - 1]!.epochMs);
    // Each bucket's average sits between the lowest and highest stored apogee.
    const { rows } = await t.database.pool.query<{ lo: number; hi: number }>(
      'select min(apogee_altitude_km)::float8 as lo, max(apogee_altitude_km)::float8 as hi from element_sets',
    );
    for (const p of trend) {
      expect(p.apogeeKm).toBeGreaterThanOrEqual(rows[0]!.lo);
      expect(p.apogeeKm).toBeLessThanOrEqual(rows[0]!.hi);
    }
    expect(res.body.sailYield).toBeNull(); // no sailing periods yet
  });

  it('states the sail yield as semi-major axis gained per day, the same as from ε = −μ/2a', async () => {
    const post = (body: object) =>
      engineer
        .post(`/api/orbit/spacecraft/${craftId}/sailing-periods`)
        .set('x-csrf-token', engineer.csrf)
        .send({ note: '', ...body })
        .expect(201);
    await post({ startAt: '2026-01-01T00:00:00Z', endAt: '2026-04-10T00:00:00Z', mode: 'edge-on' });
    await post({ startAt: '2026-04-11T00:00:00Z', endAt: '2026-06-09T00:00:00Z', mode: 'raising' });
    const res = await engineer.get('/api/public/orbit').expect(200);
    const y = res.body.sailYield;
    expect(y).toMatchObject({ raisingPeriods: 1, edgeOnPeriods: 1 });
    expect(y.energyJPerKgPerDay).toBeGreaterThan(0);
    // Independent check (vis-viva specific energy ε = −μ/2a, e.g. Vallado, Fundamentals of Astrodynamics, ch. 1):
    // the semi-major axis after one day of the yield, minus before, by finite difference rather than the derivative.
    const mu = MU_WGS72_KM3_PER_S2 * 1e9;
    const aM = y.atSemiMajorAxisKm * 1e3;
    const e0 = -mu / (2 * aM);
    const aAfterM = -mu / (2 * (e0 + y.energyJPerKgPerDay));
    expect(y.semiMajorAxisKmPerDay).toBeCloseTo((aAfterM - aM) / 1e3, 4);
    // The made-up history climbs 4e-5 rev/day² faster while raising: tens of metres a day, not kilometres.
    expect(y.semiMajorAxisKmPerDay).toBeGreaterThan(0.01);
    expect(y.semiMajorAxisKmPerDay).toBeLessThan(1);
  });
});
