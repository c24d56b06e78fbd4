import { createHash } from 'node:crypto';
import { and, asc, desc, eq, gte, lte, sql, type SQL } from 'drizzle-orm';
import { csvChunks, type CsvCell } from '../../lib/csv';
import { msToIso } from '../../../shared/orbit/epoch';
import type pg from 'pg';
import type { Db } from '../../db/client';
import { accounts } from '../accounts/accounts.tables';
import { recordAudit, recordChange } from '../audit/audit.repository';
import { dedupeElementSets, fitTrendSamples, type Trend, type TrendSample } from '../../../shared/orbit/trends';
import { compareSailingPeriods } from '../../../shared/orbit/sailing-periods';
import { semiMajorAxisRateKmPerDay } from '../../../shared/orbit/physics';
import { MU_WGS72_KM3_PER_S2 } from '../../../shared/orbit/constants';
import { median } from '../../../shared/orbit/robust-stats';
import { betaAngleDeg, sailThrustGeometry } from '../../../shared/orbit/sunlight';
import { crossoverAltitudeKm, orbitEnergyBalance } from '../../../shared/orbit/sail-drag-balance';
import { estimateLifetime } from '../../../shared/orbit/lifetime';
import type { SailCraft, SolarActivity } from '../../../shared/orbit/types';
import type { HistoryQuery, SailingPeriodInput } from '../../../shared/schemas/orbit';
import type {
  ElementSetFileReply,
  HistoryPageReply,
  SailingPeriodReply,
  SailYieldReply,
  TrendRateWindowReply,
  TrendReply,
  TrendViewReply,
} from '../../../shared/schemas/orbit-replies';
import { elementSetFiles, elementSets, sailingPeriods, spacecraft } from './orbit.tables';
import { fileNotFound, sailingPeriodNotFound, sailingPeriodOverlap, spacecraftNotFound } from './orbit.errors';
import { overlapping, trimToFree } from '../../../shared/orbit/period-overlap';
import { spacecraftView, type SpacecraftRow } from './spacecraft.repository';

const DAY_MS = 86_400_000;
/** Points of the public summary's small trend chart. */
export const PUBLIC_TREND_POINTS = 60;
/** Default window of the rate lines: the last 30 days of the history. */
export const DEFAULT_RATE_WINDOW_DAYS = 30;
/** Outliers drawn in one view at most (they are rare; a flood of them would be its own finding). */
const OUTLIERS_SHOWN = 5_000;

export const SAFETY_CAUTION =
  'Estimates from simple models — not for collision or re-entry safety decisions; rely on official space-surveillance providers.';

// The stored orbit columns the history table shows, and may sort by (epoch sorts by its number).
const orbitColumns = {
  elementSetNo: elementSets.elementSetNo,
  semiMajorAxisKm: elementSets.semiMajorAxisKm,
  eccentricity: elementSets.eccentricity,
  inclinationDeg: elementSets.inclinationDeg,
  apogeeAltitudeKm: elementSets.apogeeAltitudeKm,
  perigeeAltitudeKm: elementSets.perigeeAltitudeKm,
  bstar: elementSets.bstar,
} as const;
const sortColumns = { epoch: elementSets.epochMs, ...orbitColumns } as const;

type PeriodRow = typeof sailingPeriods.$inferSelect;
export function sailingPeriodView(p: PeriodRow): SailingPeriodReply {
  return {
    id: p.id,
    spacecraftId: p.spacecraftId,
    startAt: p.startAt.toISOString(),
    endAt: p.endAt.toISOString(),
    mode: p.mode,
    note: p.note,
    createdAt: p.createdAt.toISOString(),
    updatedAt: p.updatedAt.toISOString(),
  };
}

/**
 * Rows as the trend reads them: everything SGP4-derived is stored at import, so the trend only selects — once, for
 * both the series and the rate window (a slice of the same rows). Arrays, not row objects: 20k sets make 20k objects.
 */
const TREND_SQL = `select epoch_ms, apogee_altitude_km, perigee_altitude_km, mean_altitude_km, semi_major_axis_km, specific_energy_j_per_kg, outlier, element_set_no
  from element_sets where spacecraft_id = $1 order by epoch_ms, element_set_no`;
type TrendRow = [
  epochMs: number,
  apogeeKm: number,
  perigeeKm: number,
  meanAltitudeKm: number,
  semiMajorAxisKm: number,
  energyJPerKg: number,
  outlier: boolean,
  elementSetNo: number,
];
/** The same columns for one rate window (an index range scan). */
const WINDOW_SQL = `select epoch_ms, apogee_altitude_km, perigee_altitude_km, mean_altitude_km, semi_major_axis_km, specific_energy_j_per_kg, outlier, element_set_no
  from element_sets where spacecraft_id = $1 and epoch_ms >= $2 and epoch_ms <= $3 order by epoch_ms, element_set_no`;
/** The view's points (outliers apart), when there are few enough to send as they are. */
const VIEW_POINTS_SQL = `select epoch_ms, apogee_altitude_km, perigee_altitude_km, mean_altitude_km, semi_major_axis_km, specific_energy_j_per_kg
  from element_sets where spacecraft_id = $1 and not outlier and epoch_ms >= $2 and epoch_ms <= $3 order by epoch_ms, element_set_no`;
/**
 * The view's min/max per pixel column. A point's column is reduceMinMax's `min(columns − 1, floor((t − from) / width))`
 * in float8, the same IEEE doubles the JavaScript reduction uses, so both put every point in the same column. Each
 * column is its own index range (widened by 1 ms against rounding; the exact column test keeps a point in one
 * column only), so PostgreSQL aggregates straight off the covering index — no sort or hash of the whole view.
 */
const VIEW_COLUMNS_SQL = `select k, c.* from generate_series(0, $5::int - 1) as k,
  lateral (
    select count(*)::int as n, min(epoch_ms), max(epoch_ms),
      min(apogee_altitude_km), max(apogee_altitude_km), min(perigee_altitude_km), max(perigee_altitude_km),
      min(mean_altitude_km), max(mean_altitude_km), min(semi_major_axis_km), max(semi_major_axis_km),
      min(specific_energy_j_per_kg), max(specific_energy_j_per_kg)
    from element_sets
    where spacecraft_id = $1 and not outlier
      and epoch_ms >= greatest($2::float8, $2::float8 + k * $4::float8 - 1)
      and epoch_ms <= least($3::float8, $2::float8 + (k + 1) * $4::float8 + 1)
      and least($5::int - 1, floor((epoch_ms - $2::float8) / $4::float8)) = k
  ) as c
  where c.n > 0 order by k`;
/** The outliers in the view, apart. */
const VIEW_OUTLIERS_SQL = `select epoch_ms, apogee_altitude_km, perigee_altitude_km, mean_altitude_km, semi_major_axis_km, specific_energy_j_per_kg
  from element_sets where spacecraft_id = $1 and outlier and epoch_ms >= $2 and epoch_ms <= $3 order by epoch_ms, element_set_no limit $4`;
/** The history's first and last epoch (the ends of the index) and its size (counted on the narrowest index). */
const EXTENT_SQL = `select (select min(epoch_ms) from element_sets where spacecraft_id = $1) as first_ms,
  (select max(epoch_ms) from element_sets where spacecraft_id = $1) as last_ms,
  (select count(*)::int from element_sets where spacecraft_id = $1) as n`;

type WindowPoint = TrendSample & { meanAltitudeKm: number };
/** The rate window's result: the costly part (Theil–Sen fits over the window's pairs), kept per history state. */
type WindowTrend = Pick<Trend, 'rates' | 'intervals' | 'counts' | 'spanDays'> & { points: WindowPoint[] };

type TrendKey = 'apogeeAltitudeKm' | 'perigeeAltitudeKm' | 'meanAltitudeKm' | 'semiMajorAxisKm' | 'specificEnergyJPerKg';

/** A straight line for the chart: the engine's Theil–Sen slope through the median of the window's good points. */
function rateLine(trend: WindowTrend, key: TrendKey, slopePerDay: number) {
  const good = trend.points.filter((p) => !p.outlier);
  if (good.length < 2) return null;
  const t0 = good[0]!.epochMs;
  const intercept = median(Float64Array.from(good, (p) => p[key] - (slopePerDay * (p.epochMs - t0)) / DAY_MS));
  const t1 = good[good.length - 1]!.epochMs;
  return { fromMs: t0, toMs: t1, fromValue: intercept, toValue: intercept + (slopePerDay * (t1 - t0)) / DAY_MS, slopePerDay };
}

/**
 * The rate window over the stored rows (sorted by epoch): the engine's computeTrend — same de-duplication, outlier
 * screen and Theil–Sen fits — on the derived values stored at import instead of deriving them again.
 */
function windowTrend(rows: readonly TrendRow[], fromMs: number, toMs: number, catalogNumber: string): WindowTrend {
  const inWindow: { catalogNumber: string; epochMs: number; elementSetNo: number; row: TrendRow }[] = [];
  for (const row of rows)
    if (row[0] >= fromMs && row[0] <= toMs) inWindow.push({ catalogNumber, epochMs: row[0], elementSetNo: row[7], row });
  const { sets: unique, duplicatesRemoved } = dedupeElementSets(inWindow);
  const points: WindowPoint[] = unique.map(({ row: r }) => ({
    epochMs: r[0],
    apogeeAltitudeKm: r[1],
    perigeeAltitudeKm: r[2],
    meanAltitudeKm: r[3],
    semiMajorAxisKm: r[4],
    specificEnergyJPerKg: r[5],
    outlier: false,
    outlierScore: 0,
  }));
  const fit = fitTrendSamples(points);
  return {
    points,
    rates: fit.rates,
    intervals: fit.intervals,
    counts: {
      input: inWindow.length,
      inWindow: inWindow.length,
      duplicatesRemoved,
      outliers: fit.outliers,
      used: fit.used,
      otherObjects: 0,
    },
    spanDays: points.length ? (points[points.length - 1]!.epochMs - points[0]!.epochMs) / DAY_MS : 0,
  };
}

function sailCraftOf(c: SpacecraftRow, dragAreaM2: number): SailCraft {
  return { massKg: c.massKg, sailAreaM2: c.sailAreaM2, reflectivity: c.sailReflectivity, dragCoefficient: c.dragCoefficient, dragAreaM2 };
}

/**
 * Drag area while raising, orbit-averaged: the sail faces the flow on the usable (sunlit, receding) arc and is
 * turned edge-on for the rest — an assumption of this desk, stated beside the numbers.
 */
export function raisingDragAreaM2(c: Pick<SpacecraftRow, 'sailAreaM2' | 'dragAreaEdgeOnM2'>, usableFraction: number) {
  return usableFraction * c.sailAreaM2 + (1 - usableFraction) * c.dragAreaEdgeOnM2;
}

const HISTORY_CSV_HEADERS = [
  'epoch_utc',
  'element_set_no',
  'semi_major_axis_km',
  'eccentricity',
  'inclination_deg',
  'apogee_altitude_km',
  'perigee_altitude_km',
  'bstar_per_earth_radius',
  'outlier',
  'source_file',
  'source_line',
] as const;
type HistoryCsvRow = [number, number, number, number, number, number, number, number, boolean, string, number];

function isOverlapViolation(err: unknown): boolean {
  const e = err as { code?: string; constraint?: string; cause?: { code?: string; constraint?: string } };
  return (e.code ?? e.cause?.code) === '23P01' && (e.constraint ?? e.cause?.constraint) === 'sailing_periods_no_overlap';
}

export function createOrbitService({ db }: { db: Db }) {
  const pool = (db as unknown as { $client: pg.Pool }).$client;
  const windowCache = new Map<string, WindowTrend>();

  async function craftOf(id: string) {
    const [row] = await db.select().from(spacecraft).where(eq(spacecraft.id, id));
    if (!row) throw spacecraftNotFound();
    return row;
  }

  async function periodsOf(spacecraftId: string) {
    return db.select().from(sailingPeriods).where(eq(sailingPeriods.spacecraftId, spacecraftId)).orderBy(asc(sailingPeriods.startAt));
  }

  /**
   * Runs a save; when the database's exclusion constraint refuses it (also when another save got in first), answers
   * a 409 naming the period in the way and the trim that would fit.
   */
  async function guardOverlap<T>(spacecraftId: string, ownId: string | null, input: SailingPeriodInput, save: () => Promise<T>) {
    try {
      return await save();
    } catch (err) {
      if (!isOverlapViolation(err)) throw err;
      const requested = { startMs: Date.parse(input.startAt), endMs: Date.parse(input.endAt) };
      const others = (await periodsOf(spacecraftId))
        .filter((p) => p.id !== ownId)
        .map((p) => ({ mode: p.mode, startMs: p.startAt.getTime(), endMs: p.endAt.getTime() }));
      const first = overlapping(requested, others)[0];
      // The other save may have been rolled back meanwhile: still refuse, naming what the constraint saw.
      if (!first) throw sailingPeriodOverlap(requested, { mode: 'other', ...requested }, null);
      throw sailingPeriodOverlap(requested, first, trimToFree(requested, others));
    }
  }

  function historyFilter(spacecraftId: string, q: Pick<HistoryQuery, 'from' | 'to'>) {
    const where: SQL[] = [eq(elementSets.spacecraftId, spacecraftId)];
    if (q.from) where.push(gte(elementSets.epochMs, Date.parse(q.from)));
    if (q.to) where.push(lte(elementSets.epochMs, Date.parse(q.to)));
    return and(...where)!;
  }

  const historySelect = {
    id: elementSets.id,
    epoch: elementSets.epoch,
    epochMs: elementSets.epochMs,
    ...orbitColumns,
    outlier: elementSets.outlier,
    sourceLine: elementSets.sourceLine,
    fileId: elementSets.fileId,
    fileName: elementSetFiles.filename,
  };

  /** The rows of one rate window, in the trend's order: an index range scan, not the whole history. */
  async function windowRows(craftId: string, fromMs: number, toMs: number) {
    const { rows } = await pool.query<TrendRow>({ text: WINDOW_SQL, values: [craftId, fromMs, toMs], rowMode: 'array' });
    return rows;
  }

  /**
   * The rate window's fit and rate lines. The fit (Theil–Sen over the window's pairs, the costly part) is kept per
   * window and per content of the window's rows (a hash of what the fit reads), so a new import into the window, or
   * a removed file, is a new key — and the history outside the window never needs to be read for it.
   */
  function rateWindow(craft: SpacecraftRow, rows: readonly TrendRow[], fromMs: number, toMs: number) {
    const fp = new Float64Array(rows.length * 7);
    let o = 0;
    for (let i = 0; i < rows.length; i++) {
      const r = rows[i]!;
      if (r[0] < fromMs || r[0] > toMs) continue;
      fp[o++] = r[0];
      fp[o++] = r[1];
      fp[o++] = r[2];
      fp[o++] = r[3];
      fp[o++] = r[4];
      fp[o++] = r[5];
      fp[o++] = r[7];
    }
    const digest = createHash('sha1')
      .update(new Uint8Array(fp.buffer, 0, o * 8))
      .digest('base64');
    const cacheKey = `${craft.id}|${craft.catalogNumber}|${fromMs}|${toMs}|${digest}`;
    let trend = windowCache.get(cacheKey);
    if (!trend) {
      trend = windowTrend(rows, fromMs, toMs, craft.catalogNumber);
      windowCache.set(cacheKey, trend);
      while (windowCache.size > 32) windowCache.delete(windowCache.keys().next().value!);
    }
    const r = trend.rates;
    const rateLines = r
      ? {
          apogee: rateLine(trend, 'apogeeAltitudeKm', r.apogeeKmPerDay),
          perigee: rateLine(trend, 'perigeeAltitudeKm', r.perigeeKmPerDay),
          meanAltitude: rateLine(trend, 'meanAltitudeKm', r.semiMajorAxisKmPerDay),
          semiMajorAxis: rateLine(trend, 'semiMajorAxisKm', r.semiMajorAxisKmPerDay),
          energy: rateLine(trend, 'specificEnergyJPerKg', r.energyJPerKgPerDay),
        }
      : null;
    return {
      window: { fromMs, toMs, outlierEpochsMs: trend.points.filter((p) => p.outlier).map((p) => p.epochMs) },
      rates: trend.rates,
      intervals: trend.intervals,
      counts: trend.counts,
      spanDays: trend.spanDays,
      rateLines,
    };
  }

  /** Every stored row and the series built from them, read afresh on every call (snapshots freeze from these). */
  async function loadRows(craftId: string) {
    const { rows } = await pool.query<TrendRow>({ text: TREND_SQL, values: [craftId], rowMode: 'array' });
    const n = rows.length;
    const series = {
      epochMs: new Array<number>(n),
      apogeeKm: new Array<number>(n),
      perigeeKm: new Array<number>(n),
      meanAltitudeKm: new Array<number>(n),
      semiMajorAxisKm: new Array<number>(n),
      energyJPerKg: new Array<number>(n),
      outlier: [] as number[],
    };
    for (let i = 0; i < n; i++) {
      const r = rows[i]!;
      series.epochMs[i] = r[0];
      series.apogeeKm[i] = r[1];
      series.perigeeKm[i] = r[2];
      series.meanAltitudeKm[i] = r[3];
      series.semiMajorAxisKm[i] = r[4];
      series.energyJPerKg[i] = r[5];
      if (r[6]) series.outlier.push(i);
    }
    return { rows, series };
  }

  async function loadTrend(craft: SpacecraftRow, window: { fromMs?: number; toMs?: number }) {
    const { rows, series } = await loadRows(craft.id);
    const n = series.epochMs.length;
    const lastMs = n ? series.epochMs[n - 1]! : null;
    const toMs = window.toMs ?? lastMs ?? Date.now();
    const fromMs = window.fromMs ?? toMs - DEFAULT_RATE_WINDOW_DAYS * DAY_MS;
    return { series, ...rateWindow(craft, rows, fromMs, toMs) };
  }

  /**
   * The chart's view reduced inside PostgreSQL: one row per pixel column with its count, first and last epoch and
   * each series' lowest and highest value — the same columns as shared/charts/reduce.ts (the same float8 arithmetic
   * as the JavaScript numbers), read from the covering index, so 100,000 sets leave the database as ~2 × columns
   * values. A view of at most two points per column comes as its points, as reduceMinMax gives them.
   */
  async function reducedView(craftId: string, fromMs: number, toMs: number, columns: number, totalSets: number) {
    const keys = ['apogeeKm', 'perigeeKm', 'meanAltitudeKm', 'semiMajorAxisKm', 'energyJPerKg'] as const;
    const raw = async () => {
      const { rows } = await pool.query<number[]>({ text: VIEW_POINTS_SQL, values: [craftId, fromMs, toMs], rowMode: 'array' });
      const out = { epochMs: rows.map((r) => r[0]!), values: keys.map((_, j) => rows.map((r) => r[j + 1]!)) };
      return { ...out, reduced: false, pointsInView: rows.length };
    };
    if (totalSets <= 2 * columns) return raw();
    const width = (toMs - fromMs) / columns || 1;
    const { rows } = await pool.query<number[]>({
      text: VIEW_COLUMNS_SQL,
      values: [craftId, fromMs, toMs, width, columns],
      rowMode: 'array',
    });
    let pointsInView = 0;
    for (const r of rows) pointsInView += r[1]!;
    if (pointsInView <= 2 * columns) return raw();
    const epochMs: number[] = [];
    const values: number[][] = keys.map(() => []);
    for (const r of rows) {
      // r: column, count, first epoch, last epoch, then (min, max) of each series.
      if (r[1] === 1) {
        epochMs.push(r[2]!);
        for (let j = 0; j < keys.length; j++) values[j]!.push(r[4 + 2 * j]!);
      } else {
        epochMs.push(r[2]!, r[3]!);
        for (let j = 0; j < keys.length; j++) values[j]!.push(r[4 + 2 * j]!, r[5 + 2 * j]!);
      }
    }
    return { epochMs, values, reduced: true, pointsInView };
  }

  /** At most PUBLIC_TREND_POINTS averages of apogee and perigee over the whole history (outliers left out), for a small chart. */
  async function publicTrend(spacecraftId: string) {
    const { rows } = await pool.query<{ epoch_ms: number; apogee_km: number; perigee_km: number; sets: number }>(
      `with span as (select min(epoch_ms) as lo, max(epoch_ms) as hi from element_sets where spacecraft_id = $1 and not outlier)
       select avg(e.epoch_ms)::float8 as epoch_ms, avg(e.apogee_altitude_km)::float8 as apogee_km,
              avg(e.perigee_altitude_km)::float8 as perigee_km, count(*)::int as sets
         from element_sets e, span
        where e.spacecraft_id = $1 and not e.outlier
        group by least(floor((e.epoch_ms - span.lo) / greatest((span.hi - span.lo) / $2::float8, 1)), $2 - 1)
        order by 1`,
      [spacecraftId, PUBLIC_TREND_POINTS],
    );
    return rows.map((r) => ({ epochMs: Math.round(r.epoch_ms), apogeeKm: r.apogee_km, perigeeKm: r.perigee_km, sets: r.sets }));
  }

  /** The measured sail yield (raising minus edge-on periods), also as the semi-major axis it adds per day. */
  async function publicSailYield(spacecraftId: string) {
    const [periods, { rows }] = await Promise.all([
      periodsOf(spacecraftId),
      pool.query<{ epoch_ms: number; e: number; a: number; outlier: boolean }>(
        'select epoch_ms, specific_energy_j_per_kg as e, semi_major_axis_km as a, outlier from element_sets where spacecraft_id = $1 order by epoch_ms',
        [spacecraftId],
      ),
    ]);
    const c = compareSailingPeriods(
      rows.map((r) => ({ epochMs: r.epoch_ms, specificEnergyJPerKg: r.e, semiMajorAxisKm: r.a, outlier: r.outlier })),
      periods.map((p) => ({ startMs: p.startAt.getTime(), endMs: p.endAt.getTime(), mode: p.mode })),
    );
    const last = rows.findLast((r) => !r.outlier);
    if (c.sailYieldMPerS2 === null || c.sailYieldJPerKgPerDay === null || !last) return null;
    return {
      accelMPerS2: c.sailYieldMPerS2,
      uncertaintyMPerS2: c.uncertaintyMPerS2,
      energyJPerKgPerDay: c.sailYieldJPerKgPerDay,
      // The sets' energies come from WGS-72's μ (derived.ts), so the conversion back uses the same μ.
      semiMajorAxisKmPerDay: semiMajorAxisRateKmPerDay(c.sailYieldJPerKgPerDay, last.a, MU_WGS72_KM3_PER_S2 * 1e9),
      atSemiMajorAxisKm: last.a,
      raisingPeriods: c.raising.periodCount,
      edgeOnPeriods: c.off.periodCount,
    };
  }

  return {
    async listHistory(spacecraftId: string, q: HistoryQuery): Promise<HistoryPageReply> {
      await craftOf(spacecraftId);
      const where = historyFilter(spacecraftId, q);
      const col = sortColumns[q.sort];
      const order = q.dir === 'asc' ? [asc(col), asc(elementSets.id)] : [desc(col), desc(elementSets.id)];
      const [rows, [count]] = await Promise.all([
        db
          .select(historySelect)
          .from(elementSets)
          .innerJoin(elementSetFiles, eq(elementSetFiles.id, elementSets.fileId))
          .where(where)
          .orderBy(...order)
          .limit(q.pageSize)
          .offset((q.page - 1) * q.pageSize),
        db
          .select({ n: sql<number>`count(*)::int` })
          .from(elementSets)
          .where(where),
      ]);
      const total = count?.n ?? 0;
      return {
        rows: rows.map((r) => ({ ...r, epoch: r.epoch.toISOString() })),
        page: q.page,
        pageSize: q.pageSize,
        total,
        pageCount: Math.max(1, Math.ceil(total / q.pageSize)),
      };
    },

    /**
     * CSV of the filtered history, in the chosen order, in chunks to send as they are written (through the shared
     * writer: quoting, inert formulas). One query of the columns the file holds, as arrays; the epoch's text comes
     * from its stored milliseconds, the same text the import stored it from (msToIso).
     */
    async historyCsv(spacecraftId: string, q: HistoryQuery): Promise<Iterable<string>> {
      await craftOf(spacecraftId);
      const values: unknown[] = [spacecraftId];
      let where = 's.spacecraft_id = $1';
      if (q.from) where += ` and s.epoch_ms >= $${values.push(Date.parse(q.from))}`;
      if (q.to) where += ` and s.epoch_ms <= $${values.push(Date.parse(q.to))}`;
      const dir = q.dir === 'asc' ? 'asc' : 'desc';
      const { rows } = await pool.query<HistoryCsvRow>({
        text: `select s.epoch_ms, s.element_set_no, s.semi_major_axis_km, s.eccentricity, s.inclination_deg, s.apogee_altitude_km,
                      s.perigee_altitude_km, s.bstar, s.outlier, f.filename, s.source_line
                 from element_sets s join element_set_files f on f.id = s.file_id
                where ${where} order by s.${sortColumns[q.sort].name} ${dir}, s.id ${dir}`,
        values,
        rowMode: 'array',
      });
      const cells = new Array<CsvCell[]>(rows.length);
      for (let i = 0; i < rows.length; i++) {
        const r = rows[i]!;
        cells[i] = [
          msToIso(r[0]),
          r[1],
          r[2].toFixed(4),
          r[3].toFixed(7),
          r[4].toFixed(4),
          r[5].toFixed(4),
          r[6].toFixed(4),
          r[7].toExponential(5),
          r[8],
          r[9],
          r[10],
        ];
      }
      return csvChunks(HISTORY_CSV_HEADERS, cells);
    },

    /** Every stored point (snapshots freeze from this). */
    async getTrend(spacecraftId: string, window: { fromMs?: number; toMs?: number }) {
      const craft = await craftOf(spacecraftId);
      const [trend, periods] = await Promise.all([loadTrend(craft, window), periodsOf(spacecraftId)]);
      return { spacecraft: spacecraftView(craft), ...trend, sailingPeriods: periods.map(sailingPeriodView) };
    },

    /**
     * What the chart draws: the points of the view reduced to min/max per pixel column (so a wider view comes at a
     * lower resolution) and the outliers in the view apart. Nothing here reads the whole history into JavaScript:
     * the reduction runs in PostgreSQL over the covering index. No rate fit either: a zoom step asks only for this.
     */
    async getChartView(spacecraftId: string, view: { fromMs?: number; toMs?: number; columns: number }): Promise<TrendViewReply> {
      const [craft, periods, { rows: ext }] = await Promise.all([
        craftOf(spacecraftId),
        periodsOf(spacecraftId),
        pool.query<{ first_ms: number | null; last_ms: number | null; n: number }>(EXTENT_SQL, [spacecraftId]),
      ]);
      const { first_ms: firstMs, last_ms: lastMs, n } = ext[0]!;
      const fromMs = view.fromMs ?? firstMs ?? 0,
        toMs = view.toMs ?? lastMs ?? 0;
      const [r, { rows: out }] = await Promise.all([
        reducedView(craft.id, fromMs, toMs, view.columns, n),
        pool.query<number[]>({ text: VIEW_OUTLIERS_SQL, values: [craft.id, fromMs, toMs, OUTLIERS_SHOWN], rowMode: 'array' }),
      ]);
      const pick = (vals: number[][]) => ({
        apogeeKm: vals[0]!,
        perigeeKm: vals[1]!,
        meanAltitudeKm: vals[2]!,
        semiMajorAxisKm: vals[3]!,
        energyJPerKg: vals[4]!,
      });
      return {
        spacecraft: spacecraftView(craft),
        series: { epochMs: r.epochMs, ...pick(r.values) },
        outliers: { epochMs: out.map((o) => o[0]!), ...pick([1, 2, 3, 4, 5].map((j) => out.map((o) => o[j]!))) },
        view: { fromMs, toMs, columns: view.columns, reduced: r.reduced, pointsInView: r.pointsInView },
        extent: { firstMs, lastMs, total: n },
        sailingPeriods: periods.map(sailingPeriodView),
      };
    },

    /** The rate window's fit (Theil–Sen rates, intervals, rate lines), reading only the window's own rows. */
    async getRateWindow(spacecraftId: string, window: { fromMs?: number; toMs?: number }): Promise<TrendRateWindowReply> {
      const craft = await craftOf(spacecraftId);
      let toMs = window.toMs;
      if (toMs === undefined) {
        const { rows } = await pool.query<{ last_ms: number | null }>(
          'select max(epoch_ms) as last_ms from element_sets where spacecraft_id = $1',
          [craft.id],
        );
        toMs = rows[0]?.last_ms ?? Date.now();
      }
      const fromMs = window.fromMs ?? toMs - DEFAULT_RATE_WINDOW_DAYS * DAY_MS;
      return rateWindow(craft, await windowRows(craft.id, fromMs, toMs), fromMs, toMs);
    },

    /** The chart's view and the rate window in one reply. */
    async getTrendView(
      spacecraftId: string,
      window: { fromMs?: number; toMs?: number },
      view: { fromMs?: number; toMs?: number; columns: number },
    ): Promise<TrendReply> {
      const [chart, rate] = await Promise.all([this.getChartView(spacecraftId, view), this.getRateWindow(spacecraftId, window)]);
      const { sailingPeriods, ...rest } = chart;
      return { ...rest, ...rate, sailingPeriods };
    },

    async getSailYield(spacecraftId: string): Promise<SailYieldReply> {
      const craft = await craftOf(spacecraftId);
      const periods = await periodsOf(spacecraftId);
      const { rows } = await pool.query<{ epoch_ms: number; e: number; a: number; outlier: boolean }>(
        'select epoch_ms, specific_energy_j_per_kg as e, semi_major_axis_km as a, outlier from element_sets where spacecraft_id = $1 order by epoch_ms',
        [craft.id],
      );
      const comparison = compareSailingPeriods(
        rows.map((r) => ({ epochMs: r.epoch_ms, specificEnergyJPerKg: r.e, semiMajorAxisKm: r.a, outlier: r.outlier })),
        periods.map((p) => ({ startMs: p.startAt.getTime(), endMs: p.endAt.getTime(), mode: p.mode })),
      );
      const { rows: latestRows } = await pool.query<{
        epoch_ms: number;
        mean_altitude_km: number;
        semi_major_axis_km: number;
        eccentricity: number;
        inclination_deg: number;
        raan_deg: number;
      }>(
        'select epoch_ms, mean_altitude_km, semi_major_axis_km, eccentricity, inclination_deg, raan_deg from element_sets where spacecraft_id = $1 and not outlier order by epoch_ms desc limit 1',
        [craft.id],
      );
      const latest = latestRows[0];
      const sailApplies = craft.sailAreaM2 > 0;
      if (!latest)
        return {
          spacecraft: spacecraftView(craft),
          sailApplies,
          comparison: sailApplies ? comparison : null,
          model: null,
          lifetime: null,
          caution: SAFETY_CAUTION,
        };
      if (!sailApplies) {
        // A comparison object without a sail: no sail yield, no crossover; its lifetime is drag alone.
        const dragOnly = estimateLifetime(
          { epochMs: latest.epoch_ms, semiMajorAxisKm: latest.semi_major_axis_km, eccentricity: latest.eccentricity },
          { massKg: craft.massKg, dragAreaM2: craft.dragAreaEdgeOnM2, dragCoefficient: craft.dragCoefficient },
        );
        return {
          spacecraft: spacecraftView(craft),
          sailApplies,
          comparison: null,
          model: null,
          lifetime: dragOnly ? { ...dragOnly, basis: 'drag only, no sail' } : null,
          caution: SAFETY_CAUTION,
        };
      }
      const altitudeKm = latest.mean_altitude_km;
      const betaDeg = betaAngleDeg({ epochMs: latest.epoch_ms, inclinationDeg: latest.inclination_deg, raanDeg: latest.raan_deg });
      const geometry = sailThrustGeometry({ altitudeKm, betaDeg, samples: 720 });
      const raisingArea = raisingDragAreaM2(craft, geometry.usableFraction);
      const activities: SolarActivity[] = ['low', 'mean', 'high'];
      const byActivity = activities.map((activity) => {
        const raising = orbitEnergyBalance(sailCraftOf(craft, raisingArea), altitudeKm, { density: activity, betaDeg });
        const edgeOn = orbitEnergyBalance(sailCraftOf(craft, craft.dragAreaEdgeOnM2), altitudeKm, {
          density: activity,
          betaDeg,
          sailing: false,
        });
        return {
          activity,
          densityKgPerM3: raising.densityKgPerM3,
          expectedSailAccelMPerS2: raising.sailGainWPerKg / raising.speedMPerS,
          dragAccelRaisingMPerS2: raising.dragLossWPerKg / raising.speedMPerS,
          dragAccelEdgeOnMPerS2: edgeOn.dragLossWPerKg / edgeOn.speedMPerS,
          netRaisingSemiMajorAxisKmPerDay: raising.semiMajorAxisRateKmPerDay,
          edgeOnSemiMajorAxisKmPerDay: edgeOn.semiMajorAxisRateKmPerDay,
          crossoverAltitudeKm: crossoverAltitudeKm(sailCraftOf(craft, raisingArea), { density: activity, betaDeg }),
        };
      });
      const lifetime = estimateLifetime(
        { epochMs: latest.epoch_ms, semiMajorAxisKm: latest.semi_major_axis_km, eccentricity: latest.eccentricity },
        { massKg: craft.massKg, dragAreaM2: craft.dragAreaEdgeOnM2, dragCoefficient: craft.dragCoefficient },
      );
      return {
        spacecraft: spacecraftView(craft),
        sailApplies,
        comparison,
        model: {
          atEpochMs: latest.epoch_ms,
          altitudeKm,
          betaDeg,
          sunlitFraction: geometry.sunlitFraction,
          usableThrustFraction: geometry.usableFraction,
          raisingDragAreaM2: raisingArea,
          byActivity,
          assumptions: [
            'circular orbit at the latest set’s mean altitude; Sun elevation above the orbit plane (β) at that epoch',
            'sail normal kept along the velocity on the sunlit arc where the craft recedes from the Sun, edge-on elsewhere',
            `drag area while raising averaged over the orbit: ${raisingArea.toFixed(2)} m²; edge-on ${craft.dragAreaEdgeOnM2} m²`,
          ],
        },
        lifetime: lifetime ? { ...lifetime, basis: 'sail edge-on, drag only' } : null,
        caution: SAFETY_CAUTION,
      };
    },

    async listFiles(spacecraftId: string): Promise<ElementSetFileReply[]> {
      await craftOf(spacecraftId);
      const rows = await db
        .select({
          id: elementSetFiles.id,
          filename: elementSetFiles.filename,
          format: elementSetFiles.format,
          byteSize: elementSetFiles.byteSize,
          contentSha256: elementSetFiles.contentSha256,
          recordCount: elementSetFiles.recordCount,
          importedCount: elementSetFiles.importedCount,
          duplicateCount: elementSetFiles.duplicateCount,
          invalidCount: elementSetFiles.invalidCount,
          uploadedAt: elementSetFiles.uploadedAt,
          uploadedBy: accounts.displayName,
        })
        .from(elementSetFiles)
        .leftJoin(accounts, eq(accounts.id, elementSetFiles.uploadedBy))
        .where(eq(elementSetFiles.spacecraftId, spacecraftId))
        .orderBy(desc(elementSetFiles.uploadedAt));
      return rows.map((r) => ({ ...r, uploadedAt: r.uploadedAt.toISOString() }));
    },

    async getFileOriginal(fileId: string) {
      const [row] = await db
        .select({ filename: elementSetFiles.filename, content: elementSetFiles.content })
        .from(elementSetFiles)
        .where(eq(elementSetFiles.id, fileId));
      if (!row) throw fileNotFound();
      return row;
    },

    async listSailingPeriods(spacecraftId: string) {
      await craftOf(spacecraftId);
      return (await periodsOf(spacecraftId)).map(sailingPeriodView);
    },

    async createSailingPeriod(actorId: string | null, spacecraftId: string, input: SailingPeriodInput) {
      await craftOf(spacecraftId);
      return guardOverlap(spacecraftId, null, input, () =>
        db.transaction(async (tx) => {
          const [row] = await tx
            .insert(sailingPeriods)
            .values({
              spacecraftId,
              startAt: new Date(input.startAt),
              endAt: new Date(input.endAt),
              mode: input.mode,
              note: input.note,
              createdBy: actorId,
            })
            .returning();
          const view = sailingPeriodView(row!);
          await recordAudit(tx, {
            actorId,
            action: 'sailing_period.created',
            subjectType: 'sailing_period',
            subjectId: row!.id,
            after: view,
          });
          return view;
        }),
      );
    },

    async updateSailingPeriod(actorId: string | null, id: string, input: SailingPeriodInput) {
      const [current] = await db
        .select({ spacecraftId: sailingPeriods.spacecraftId })
        .from(sailingPeriods)
        .where(eq(sailingPeriods.id, id));
      if (!current) throw sailingPeriodNotFound();
      return guardOverlap(current.spacecraftId, id, input, () =>
        db.transaction(async (tx) => {
          const [before] = await tx.select().from(sailingPeriods).where(eq(sailingPeriods.id, id)).for('update');
          if (!before) throw sailingPeriodNotFound();
          const [row] = await tx
            .update(sailingPeriods)
            .set({
              startAt: new Date(input.startAt),
              endAt: new Date(input.endAt),
              mode: input.mode,
              note: input.note,
              updatedAt: new Date(),
            })
            .where(eq(sailingPeriods.id, id))
            .returning();
          const view = sailingPeriodView(row!);
          await recordChange(tx, {
            actorId,
            action: 'sailing_period.updated',
            subjectType: 'sailing_period',
            subjectId: id,
            before: sailingPeriodView(before),
            after: view,
          });
          return view;
        }),
      );
    },

    async deleteSailingPeriod(actorId: string | null, id: string) {
      await db.transaction(async (tx) => {
        const [row] = await tx.delete(sailingPeriods).where(eq(sailingPeriods.id, id)).returning();
        if (!row) throw sailingPeriodNotFound();
        await recordAudit(tx, {
          actorId,
          action: 'sailing_period.deleted',
          subjectType: 'sailing_period',
          subjectId: id,
          before: sailingPeriodView(row),
        });
      });
    },

    /** The public orbit summary: latest apogee/perigee and the trend since sail deployment. */
    async publicSummary(slug: string | null) {
      // Without a handle: the mission's own craft.
      const [craft] = await db
        .select()
        .from(spacecraft)
        .where(slug === null ? eq(spacecraft.isMissionCraft, true) : eq(spacecraft.slug, slug));
      if (!craft) throw spacecraftNotFound();
      const { rows } = await pool.query<{
        epoch_ms: number;
        epoch: Date;
        apogee_altitude_km: number;
        perigee_altitude_km: number;
        mean_altitude_km: number;
      }>(
        `select epoch_ms, epoch, apogee_altitude_km, perigee_altitude_km, mean_altitude_km from element_sets
          where spacecraft_id = $1 and not outlier order by epoch_ms desc limit 1`,
        [craft.id],
      );
      const latest = rows[0];
      const [trend, sailYield] = await Promise.all([publicTrend(craft.id), publicSailYield(craft.id)]);
      const base = {
        spacecraft: {
          name: craft.name,
          slug: craft.slug,
          catalogNumber: craft.catalogNumber,
          sailDeployedAt: craft.sailDeployedAt?.toISOString() ?? null,
        },
      };
      if (!latest) return { ...base, latest: null, sinceSailDeployment: null, trend, sailYield, caution: SAFETY_CAUTION };
      const fromMs = craft.sailDeployedAt?.getTime();
      let since = null;
      if (fromMs !== undefined) {
        const { rows: first } = await pool.query<{ epoch_ms: number; apogee_altitude_km: number; perigee_altitude_km: number }>(
          `select epoch_ms, apogee_altitude_km, perigee_altitude_km from element_sets
            where spacecraft_id = $1 and not outlier and epoch_ms >= $2 order by epoch_ms limit 1`,
          [craft.id, fromMs],
        );
        const f = first[0];
        if (f) {
          const days = (latest.epoch_ms - f.epoch_ms) / DAY_MS;
          since = {
            fromEpoch: new Date(f.epoch_ms).toISOString(),
            days,
            apogeeChangeKm: latest.apogee_altitude_km - f.apogee_altitude_km,
            perigeeChangeKm: latest.perigee_altitude_km - f.perigee_altitude_km,
            apogeeKmPerDay: days > 0 ? (latest.apogee_altitude_km - f.apogee_altitude_km) / days : null,
            perigeeKmPerDay: days > 0 ? (latest.perigee_altitude_km - f.perigee_altitude_km) / days : null,
          };
        }
      }
      return {
        ...base,
        latest: {
          epoch: latest.epoch.toISOString(),
          apogeeKm: latest.apogee_altitude_km,
          perigeeKm: latest.perigee_altitude_km,
          meanAltitudeKm: latest.mean_altitude_km,
        },
        sinceSailDeployment: since,
        trend,
        sailYield,
        caution: SAFETY_CAUTION,
      };
    },
  };
}

export type OrbitService = ReturnType<typeof createOrbitService>;
