import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Agent, TestApp } from '../setup/test-app';
import { formatTleFile } from '../../shared/orbit/tle-write';
import { parseElementSets } from '../../shared/orbit/parse-element-sets';
import { computeTrend } from '../../shared/orbit/trends';
import { compareSailingPeriods } from '../../shared/orbit/sailing-periods';
import { deriveElementSet } from '../../shared/orbit/derived';
import { simulateTern1, TERN1 } from '../../shared/orbit/simulate';
import { importUpload, orbitDesk, signedInAs, uploadAndPreview } from './orbit-helpers';

const DAY = 86_400_000;
let t: TestApp;
let engineer: Agent;
let craftId: string;
const history = simulateTern1();
const text = formatTleFile(history.sets, { withNames: true });
const parsed = parseElementSets(text).records;

beforeAll(async () => {
  ({ t, engineer, spacecraftId: craftId } = await orbitDesk());
  const preview = await uploadAndPreview(engineer, craftId, text, 'tern-1.tle');
  expect(preview.counts.duplicate).toBe(TERN1.duplicateDays.length);
  const done = await importUpload(engineer, preview.id);
  expect(done.importedCount).toBe(history.sets.length - TERN1.duplicateDays.length);
  for (const p of history.periods) {
    const res = await engineer
      .post(`/api/orbit/spacecraft/${craftId}/sailing-periods`)
      .set('x-csrf-token', engineer.csrf)
      .send({ startAt: new Date(p.startMs).toISOString(), endAt: new Date(p.endMs).toISOString(), mode: p.mode, note: '' });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
  }
}, 60_000);
afterAll(async () => t.close());

const rel = (a: number, b: number) => Math.abs(a - b) / Math.max(Math.abs(b), 1e-30);

describe('the trend endpoint', () => {
  it('gives the same rates as the orbit engine on the same sets, for a chosen window', async () => {
    const fromMs = TERN1.startMs + 210 * DAY,
      toMs = TERN1.startMs + 250 * DAY;
    const res = await engineer
      .get(`/api/orbit/spacecraft/${craftId}/trend`)
      .query({ from: new Date(fromMs).toISOString(), to: new Date(toMs).toISOString() });
    expect(res.status).toBe(200);
    const engine = computeTrend(parsed, { fromMs, toMs, catalogNumber: TERN1.catalogNumber });
    expect(engine.rates).not.toBeNull();
    for (const k of [
      'apogeeKmPerDay',
      'perigeeKmPerDay',
      'semiMajorAxisKmPerDay',
      'energyJPerKgPerDay',
      'alongTrackAccelMPerS2',
    ] as const) {
      expect(rel(res.body.rates[k], engine.rates![k]), k).toBeLessThan(1e-12);
    }
    expect(res.body.counts.used).toBe(engine.counts.used);
    expect(res.body.counts.outliers).toBe(engine.counts.outliers);
    // A raising period: apogee climbs while drag takes perigee down.
    expect(res.body.rates.apogeeKmPerDay).toBeGreaterThan(0.2);
    expect(res.body.rates.perigeeKmPerDay).toBeLessThan(0);
    expect(res.body.rateLines.apogee.slopePerDay).toBe(res.body.rates.apogeeKmPerDay);
  });

  it('returns every stored set as a series, with the SGP4-derived values of each', async () => {
    const res = await engineer.get(`/api/orbit/spacecraft/${craftId}/trend`).expect(200);
    const s = res.body.series;
    expect(s.epochMs).toHaveLength(history.sets.length - TERN1.duplicateDays.length);
    const k = 500;
    const set = parsed.find((p) => p.epochMs === s.epochMs[k])!;
    const d = deriveElementSet(set);
    expect(s.apogeeKm[k]).toBe(d.apogeeAltitudeKm);
    expect(s.perigeeKm[k]).toBe(d.perigeeAltitudeKm);
    expect(s.energyJPerKg[k]).toBe(d.specificEnergyJPerKg);
    // Default window: the last 30 days of the history.
    expect(res.body.window.toMs).toBe(s.epochMs[s.epochMs.length - 1]);
    expect(res.body.window.toMs - res.body.window.fromMs).toBe(30 * DAY);
    expect(res.body.sailingPeriods).toHaveLength(history.periods.length);
  });

  it('flags the injected bad fits as outliers and little else', async () => {
    const res = await engineer.get(`/api/orbit/spacecraft/${craftId}/trend`).expect(200);
    const flagged = new Set<number>(res.body.series.outlier.map((i: number) => res.body.series.epochMs[i]));
    const injected = history.sets.filter((s) => s.outlier).map((s) => parsed.find((p) => Math.abs(p.epochMs - s.epochMs) < 1)!.epochMs);
    expect(injected).toHaveLength(TERN1.outlierDays.length);
    for (const ms of injected) expect(flagged.has(ms), new Date(ms).toISOString()).toBe(true);
    expect(flagged.size - injected.length).toBeLessThanOrEqual(Math.ceil(parsed.length * 0.01));
  });
});

describe('the sail-yield panel', () => {
  it('compares sailing periods as the engine does and gives the model, crossover, fractions and lifetime with its caution', async () => {
    const res = await engineer.get(`/api/orbit/spacecraft/${craftId}/sail-yield`).expect(200);
    const trend = await engineer.get(`/api/orbit/spacecraft/${craftId}/trend`).expect(200);
    const s = trend.body.series;
    const outliers = new Set<number>(s.outlier);
    const points = s.epochMs.map((ms: number, i: number) => ({
      epochMs: ms,
      specificEnergyJPerKg: s.energyJPerKg[i],
      semiMajorAxisKm: s.semiMajorAxisKm[i],
      outlier: outliers.has(i),
    }));
    const engine = compareSailingPeriods(points, history.periods);
    expect(rel(res.body.comparison.sailYieldMPerS2, engine.sailYieldMPerS2!)).toBeLessThan(1e-12);
    expect(res.body.comparison.sailYieldMPerS2).toBeGreaterThan(0);
    const mean = res.body.model.byActivity.find((b: { activity: string }) => b.activity === 'mean');
    expect(mean.expectedSailAccelMPerS2).toBeGreaterThan(mean.dragAccelRaisingMPerS2);
    expect(mean.crossoverAltitudeKm).toBeGreaterThan(200);
    expect(mean.crossoverAltitudeKm).toBeLessThan(res.body.model.altitudeKm);
    expect(res.body.model.usableThrustFraction).toBeGreaterThan(0);
    expect(res.body.model.usableThrustFraction).toBeLessThanOrEqual(res.body.model.sunlitFraction);
    expect(res.body.caution).toMatch(/not for collision or re-entry safety decisions/);
    expect(res.body.lifetime.low.exceedsHorizon || res.body.lifetime.low.days > 0).toBe(true);
  });
});

describe('the history table', () => {
  it('pages, sorts and filters by date on the server', async () => {
    const from = new Date(TERN1.startMs + 100 * DAY).toISOString(),
      to = new Date(TERN1.startMs + 110 * DAY).toISOString();
    const res = await engineer
      .get(`/api/orbit/spacecraft/${craftId}/element-sets`)
      .query({ from, to, sort: 'apogeeAltitudeKm', dir: 'asc', pageSize: 7, page: 2 })
      .expect(200);
    const inRange = parsed
      .filter(
        (p, i, all) =>
          p.epochMs >= Date.parse(from) &&
          p.epochMs <= Date.parse(to) &&
          all.findIndex((q) => q.epochMs === p.epochMs && q.elementSetNo === p.elementSetNo) === i,
      )
      .map((p) => deriveElementSet(p).apogeeAltitudeKm)
      .sort((a, b) => a - b);
    expect(res.body.total).toBe(inRange.length);
    expect(res.body.rows.map((r: { apogeeAltitudeKm: number }) => r.apogeeAltitudeKm)).toEqual(inRange.slice(7, 14));
    expect(res.body.rows[0].fileName).toBe('tern-1.tle');
    const bad = await engineer.get(`/api/orbit/spacecraft/${craftId}/element-sets`).query({ sort: 'nonsense', pageSize: 0 });
    expect(bad.status).toBe(400);
  });

  it('exports the filtered history as CSV', async () => {
    const from = new Date(TERN1.startMs + 100 * DAY).toISOString(),
      to = new Date(TERN1.startMs + 101 * DAY).toISOString();
    const res = await engineer
      .get(`/api/orbit/spacecraft/${craftId}/element-sets.csv`)
      .query({ from, to, sort: 'epoch', dir: 'asc' })
      .expect(200);
    expect(res.headers['content-type']).toMatch(/text\/csv/);
    const lines = res.text.trim().split('\r\n');
    expect(lines[0]).toMatch(/^epoch_utc,element_set_no,semi_major_axis_km/);
    const n = parsed.filter((p) => p.epochMs >= Date.parse(from) && p.epochMs <= Date.parse(to)).length;
    expect(lines.length - 1).toBeGreaterThan(0);
    expect(lines.length - 1).toBeLessThanOrEqual(n);
    expect(lines[1]!.split(',')[9]).toBe('tern-1.tle');
  });
});

describe('the public orbit summary', () => {
  it('gives anyone the latest apogee and perigee and the change since sail deployment', async () => {
    const { default: request } = await import('supertest');
    const res = await request(t.app).get('/api/public/orbit/tern-1').expect(200);
    const good = parsed.filter((p) => !history.sets.find((s) => s.outlier && Math.abs(s.epochMs - p.epochMs) < 1));
    const latest = good.reduce((a, b) => (b.epochMs > a.epochMs ? b : a));
    expect(res.body.latest.apogeeKm).toBe(deriveElementSet(latest).apogeeAltitudeKm);
    expect(res.body.sinceSailDeployment.apogeeChangeKm).toBeGreaterThan(50);
    expect(res.body.sinceSailDeployment.perigeeChangeKm).toBeLessThan(0);
    expect((await request(t.app).get('/api/public/orbit/no-such-craft')).status).toBe(404);
  });

  it('keeps the trend itself to engineers and admins', async () => {
    const outreach = await signedInAs(t, 'outreach');
    expect((await outreach.get(`/api/orbit/spacecraft/${craftId}/trend`)).status).toBe(403);
  });
});
