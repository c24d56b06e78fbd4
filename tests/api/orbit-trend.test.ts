import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Agent, TestApp } from '../setup/test-app';
import { formatTleFile } from '../../shared/orbit/tle-write';
import { parseElementSets } from '../../shared/orbit/parse-element-sets';
import { computeTrend } from '../../shared/orbit/trends';
import { reduceMinMax } from '../../shared/charts/reduce';
import { trendRateWindowReplySchema, trendViewReplySchema } from '../../shared/schemas/orbit-replies';
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
    // 1,198 sets in 4,000 columns: nothing to reduce; the outliers come apart from the line.
    const res = await engineer.get(`/api/orbit/spacecraft/${craftId}/trend`).query({ columns: 4000 }).expect(200);
    const s = res.body.series;
    expect(res.body.view.reduced).toBe(false);
    expect(s.epochMs.length + res.body.outliers.epochMs.length).toBe(history.sets.length - TERN1.duplicateDays.length);
    expect(res.body.extent.total).toBe(history.sets.length - TERN1.duplicateDays.length);
    const k = 500;
    const set = parsed.find((p) => p.epochMs === s.epochMs[k])!;
    const d = deriveElementSet(set);
    expect(s.apogeeKm[k]).toBe(d.apogeeAltitudeKm);
    expect(s.perigeeKm[k]).toBe(d.perigeeAltitudeKm);
    expect(s.energyJPerKg[k]).toBe(d.specificEnergyJPerKg);
    // Default window: the last 30 days of the history.
    expect(res.body.window.toMs).toBe(res.body.extent.lastMs);
    expect(res.body.window.toMs - res.body.window.fromMs).toBe(30 * DAY);
    expect(res.body.sailingPeriods).toHaveLength(history.periods.length);
  });

  it('flags the injected bad fits as outliers and little else', async () => {
    const res = await engineer.get(`/api/orbit/spacecraft/${craftId}/trend`).query({ columns: 4000 }).expect(200);
    const flagged = new Set<number>(res.body.outliers.epochMs);
    const injected = history.sets.filter((s) => s.outlier).map((s) => parsed.find((p) => Math.abs(p.epochMs - s.epochMs) < 1)!.epochMs);
    expect(injected).toHaveLength(TERN1.outlierDays.length);
    for (const ms of injected) expect(flagged.has(ms), new Date(ms).toISOString()).toBe(true);
    expect(flagged.size - injected.length).toBeLessThanOrEqual(Math.ceil(parsed.length * 0.01));
  });
});

describe('the sail-yield panel', () => {
  it('compares sailing periods as the engine does and gives the model, crossover, fractions and lifetime with its caution', async () => {
    const res = await engineer.get(`/api/orbit/spacecraft/${craftId}/sail-yield`).expect(200);
    const trend = await engineer.get(`/api/orbit/spacecraft/${craftId}/trend`).query({ columns: 4000 }).expect(200);
    const pointsOf = (s: { epochMs: number[]; energyJPerKg: number[]; semiMajorAxisKm: number[] }, outlier: boolean) =>
      s.epochMs.map((ms, i) => ({
        epochMs: ms,
        specificEnergyJPerKg: s.energyJPerKg[i]!,
        semiMajorAxisKm: s.semiMajorAxisKm[i]!,
        outlier,
      }));
    const points = [...pointsOf(trend.body.series, false), ...pointsOf(trend.body.outliers, true)].sort((a, b) => a.epochMs - b.epochMs);
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

describe('the trend view for the chart', () => {
  it('reduces a wide view to min and max per pixel column, keeping the envelope of every series', async () => {
    const res = await engineer.get(`/api/orbit/spacecraft/${craftId}/trend`).query({ columns: 50 }).expect(200);
    const { rows } = await t.database.pool.query(
      'select epoch_ms, apogee_altitude_km, perigee_altitude_km from element_sets where spacecraft_id = $1 and not outlier order by epoch_ms',
      [craftId],
    );
    expect(res.body.view).toMatchObject({ columns: 50, reduced: true, pointsInView: rows.length });
    expect(res.body.series.epochMs.length).toBeLessThanOrEqual(100);
    expect(res.body.series.epochMs.length).toBeGreaterThan(50);
    const max = (xs: number[]) => xs.reduce((a, b) => Math.max(a, b), -Infinity);
    const min = (xs: number[]) => xs.reduce((a, b) => Math.min(a, b), Infinity);
    expect(max(res.body.series.apogeeKm)).toBe(max(rows.map((r) => r.apogee_altitude_km)));
    expect(min(res.body.series.perigeeKm)).toBe(min(rows.map((r) => r.perigee_altitude_km)));
    // Outliers come apart from the line, every one of them in the view.
    const { rows: bad } = await t.database.pool.query('select count(*)::int as n from element_sets where spacecraft_id = $1 and outlier', [
      craftId,
    ]);
    expect(res.body.outliers.epochMs.length).toBe(bad[0].n);
    expect(res.body.extent.total).toBe(rows.length + bad[0].n);
  });

  it('reduces inside the database to exactly the columns the shared reduction gives, for any column count and view', async () => {
    // The server groups per column in SQL; shared/charts/reduce.ts is the definition (and what snapshots reduce with).
    const { rows } = await t.database.pool.query(
      `select epoch_ms, apogee_altitude_km, perigee_altitude_km, mean_altitude_km, semi_major_axis_km, specific_energy_j_per_kg
         from element_sets where spacecraft_id = $1 and not outlier order by epoch_ms, element_set_no`,
      [craftId],
    );
    const epochs = rows.map((r) => r.epoch_ms as number);
    const cols = ['apogee_altitude_km', 'perigee_altitude_km', 'mean_altitude_km', 'semi_major_axis_km', 'specific_energy_j_per_kg'];
    const views = [
      { fromMs: epochs[0]!, toMs: epochs[epochs.length - 1]! },
      // Boundaries on a set's own epoch, and a view whose column width is not a whole number of milliseconds.
      { fromMs: epochs[101]!, toMs: epochs[900]! },
      { fromMs: TERN1.startMs + 7 * DAY + 1, toMs: TERN1.startMs + 301 * DAY - 7 },
    ];
    // A view ending exactly on a set (the last column also takes the point at its right edge): a few epochs are
    // whole milliseconds, which the query's ISO times can name.
    const whole = epochs.filter((e) => Number.isInteger(e));
    expect(whole.length).toBeGreaterThanOrEqual(2);
    views.push({ fromMs: whole[0]!, toMs: whole[whole.length - 1]! });
    let reducedViews = 0;
    for (const v of views)
      for (const columns of [10, 37, 123, 333]) {
        const res = await engineer
          .get(`/api/orbit/spacecraft/${craftId}/trend`)
          .query({ viewFrom: new Date(v.fromMs).toISOString(), viewTo: new Date(v.toMs).toISOString(), columns })
          .expect(200);
        const fromMs = Date.parse(new Date(v.fromMs).toISOString()),
          toMs = Date.parse(new Date(v.toMs).toISOString());
        const want = reduceMinMax(
          epochs,
          cols.map((c) => rows.map((r) => r[c] as number)),
          fromMs,
          toMs,
          columns,
        );
        const got = res.body.series;
        expect(res.body.view).toMatchObject({ reduced: want.reduced, pointsInView: want.pointsInView });
        expect(got.epochMs).toEqual(want.epochMs);
        expect([got.apogeeKm, got.perigeeKm, got.meanAltitudeKm, got.semiMajorAxisKm, got.energyJPerKg]).toEqual(want.values);
        if (want.reduced) reducedViews++;
      }
    expect(reducedViews).toBeGreaterThan(8);
  });

  it("answers the chart's view and the rate window apart, each the same as its part of the whole trend", async () => {
    const viewFrom = new Date(TERN1.startMs + 40 * DAY).toISOString(),
      viewTo = new Date(TERN1.startMs + 250 * DAY).toISOString();
    const from = new Date(TERN1.startMs + 100 * DAY).toISOString(),
      to = new Date(TERN1.startMs + 160 * DAY).toISOString();
    const whole = (
      await engineer.get(`/api/orbit/spacecraft/${craftId}/trend`).query({ viewFrom, viewTo, columns: 150, from, to }).expect(200)
    ).body;
    const view = trendViewReplySchema.parse(
      (await engineer.get(`/api/orbit/spacecraft/${craftId}/trend/view`).query({ viewFrom, viewTo, columns: 150 }).expect(200)).body,
    );
    const rates = trendRateWindowReplySchema.parse(
      (await engineer.get(`/api/orbit/spacecraft/${craftId}/trend/rates`).query({ from, to }).expect(200)).body,
    );
    expect(view.view).toMatchObject({ reduced: true, columns: 150 });
    expect({ ...view, ...rates }).toEqual(whole);
    expect(rates.rates).not.toBeNull();
    // The defaults: the whole history, and the last 30 days of it.
    const fullView = (await engineer.get(`/api/orbit/spacecraft/${craftId}/trend/view`).expect(200)).body;
    expect(fullView.view.fromMs).toBe(fullView.extent.firstMs);
    expect(fullView.view.toMs).toBe(fullView.extent.lastMs);
    const lastRates = (await engineer.get(`/api/orbit/spacecraft/${craftId}/trend/rates`).expect(200)).body;
    expect(lastRates.window.toMs).toBe(fullView.extent.lastMs);
    expect(lastRates.window.toMs - lastRates.window.fromMs).toBe(30 * DAY);
  });

  it('refuses a view or a rate window that ends before it starts, naming the field', async () => {
    const a = new Date(TERN1.startMs + 50 * DAY).toISOString(),
      b = new Date(TERN1.startMs + 40 * DAY).toISOString();
    const v = await engineer.get(`/api/orbit/spacecraft/${craftId}/trend/view`).query({ viewFrom: a, viewTo: b });
    expect(v.status).toBe(400);
    expect(JSON.stringify(v.body)).toContain('viewTo');
    const r = await engineer.get(`/api/orbit/spacecraft/${craftId}/trend/rates`).query({ from: a, to: b });
    expect(r.status).toBe(400);
    expect(JSON.stringify(r.body)).toContain('must be after the window start');
    expect((await engineer.get(`/api/orbit/spacecraft/${craftId}/trend/view`).query({ columns: 5 })).status).toBe(400);
  });

  it('gives a zoomed view at full resolution', async () => {
    const viewFrom = new Date(TERN1.startMs + 100 * DAY).toISOString(),
      viewTo = new Date(TERN1.startMs + 110 * DAY).toISOString();
    const res = await engineer.get(`/api/orbit/spacecraft/${craftId}/trend`).query({ viewFrom, viewTo, columns: 800 }).expect(200);
    expect(res.body.view.reduced).toBe(false);
    const { rows } = await t.database.pool.query(
      'select epoch_ms from element_sets where spacecraft_id = $1 and not outlier and epoch_ms between $2 and $3 order by epoch_ms',
      [craftId, Date.parse(viewFrom), Date.parse(viewTo)],
    );
    expect(res.body.series.epochMs).toEqual(rows.map((r) => r.epoch_ms));
  });

  it('draws the same series on screen as a snapshot frozen from the same window', async () => {
    const fromMs = TERN1.startMs + 20 * DAY,
      toMs = TERN1.startMs + 140 * DAY;
    const snap = await engineer
      .post('/api/orbit/snapshots')
      .set('x-csrf-token', engineer.csrf)
      .send({ spacecraftId: craftId, title: 'Same window', fromMs, toMs, series: ['apogee', 'perigee'] });
    expect(snap.status, JSON.stringify(snap.body)).toBe(201);
    const data = snap.body.snapshot.data;
    for (const columns of [60, 4000]) {
      const screen = await engineer
        .get(`/api/orbit/spacecraft/${craftId}/trend`)
        .query({ viewFrom: new Date(fromMs).toISOString(), viewTo: new Date(toMs).toISOString(), columns })
        .expect(200);
      const keep = data.points.outlier.map((o: boolean, i: number) => (o ? -1 : i)).filter((i: number) => i >= 0);
      const frozen = reduceMinMax(
        keep.map((i: number) => data.points.epochMs[i]),
        [keep.map((i: number) => data.points.values.apogee[i]), keep.map((i: number) => data.points.values.perigee[i])],
        fromMs,
        toMs,
        columns,
      );
      expect(screen.body.series.epochMs).toEqual(frozen.epochMs);
      expect(screen.body.series.apogeeKm).toEqual(frozen.values[0]);
      expect(screen.body.series.perigeeKm).toEqual(frozen.values[1]);
      expect(screen.body.outliers.epochMs).toEqual(data.points.epochMs.filter((_: number, i: number) => data.points.outlier[i]));
    }
  });
});
