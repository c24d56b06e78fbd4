// Trends over a history of element sets: sort, de-duplicate, flag outliers (modified z-score of Theil–Sen
// residuals, Iglewicz & Hoaglin 1993: |0.6745·(r − median)/MAD| > 3.5), robust rates over a window.
import { MU_WGS72_KM3_PER_S2 } from './constants';
import { deriveElementSet, type OrbitSummary } from './derived';
import { alongTrackAccelerationMPerS2 } from './physics';
import { median, medianAbsoluteDeviation, theilSenMany } from './robust-stats';
import type { ElementSet } from './types';

export type TrendPoint = OrbitSummary & {
  catalogNumber: string;
  epochMs: number;
  epoch: string;
  elementSetNo: number;
  sourceLine: number;
  bstar: number;
  decayRateKmPerDay: number;
  outlier: boolean;
  /** Largest modified z-score of this point's residuals (semi-major axis, perigee). */
  outlierScore: number;
};

export type TrendRates = {
  apogeeKmPerDay: number;
  perigeeKmPerDay: number;
  semiMajorAxisKmPerDay: number;
  energyJPerKgPerDay: number;
  /** Equivalent mean along-track acceleration (dE/dt)/v, v = √(μ/a) at the median a (WGS-72 μ) [m/s²]. */
  alongTrackAccelMPerS2: number;
};

export type Trend = {
  catalogNumber: string | null;
  points: TrendPoint[];
  rates: TrendRates | null;
  /** 95 % Theil–Sen intervals. */
  intervals: { [K in keyof TrendRates]: [number, number] } | null;
  counts: { input: number; inWindow: number; duplicatesRemoved: number; outliers: number; used: number; otherObjects: number };
  spanDays: number;
  fromMs: number | null;
  toMs: number | null;
};

export type TrendOptions = {
  fromMs?: number;
  toMs?: number;
  /** Which object; default the most frequent in `sets`. */
  catalogNumber?: string;
  /** Modified z-score above which a point is an outlier (default 3.5). */
  outlierThreshold?: number;
};

const MAD_FLOOR_KM = 1e-3;

function modifiedZ(residuals: Float64Array): Float64Array {
  const m = median(residuals);
  const mad = Math.max(medianAbsoluteDeviation(residuals, m), MAD_FLOOR_KM);
  const z = new Float64Array(residuals.length);
  for (let i = 0; i < residuals.length; i++) z[i] = Math.abs((0.6745 * (residuals[i]! - m)) / mad);
  return z;
}

/** Same object and epoch (to the millisecond) → keep the highest element-set number. Sorted by epoch. */
export function dedupeElementSets<T extends Pick<ElementSet, 'catalogNumber' | 'epochMs' | 'elementSetNo'>>(
  sets: readonly T[],
): { sets: T[]; duplicatesRemoved: number } {
  const byKey = new Map<string, T>();
  for (const s of sets) {
    const key = `${s.catalogNumber}|${Math.round(s.epochMs)}`;
    const prev = byKey.get(key);
    if (!prev || s.elementSetNo > prev.elementSetNo) byKey.set(key, s);
  }
  const out = [...byKey.values()].sort((a, b) => a.epochMs - b.epochMs);
  return { sets: out, duplicatesRemoved: sets.length - out.length };
}

export function computeTrend(sets: readonly ElementSet[], opts: TrendOptions = {}): Trend {
  const counts = { input: sets.length, inWindow: 0, duplicatesRemoved: 0, outliers: 0, used: 0, otherObjects: 0 };
  let catalogNumber = opts.catalogNumber ?? null;
  if (catalogNumber === null) {
    const freq = new Map<string, number>();
    for (const s of sets) freq.set(s.catalogNumber, (freq.get(s.catalogNumber) ?? 0) + 1);
    let best = 0;
    for (const [k, v] of freq)
      if (v > best) {
        best = v;
        catalogNumber = k;
      }
  }
  const from = opts.fromMs ?? -Infinity,
    to = opts.toMs ?? Infinity;
  const inWindow = sets.filter((s) => {
    if (s.catalogNumber !== catalogNumber) {
      counts.otherObjects++;
      return false;
    }
    return s.epochMs >= from && s.epochMs <= to;
  });
  counts.inWindow = inWindow.length;
  const { sets: unique, duplicatesRemoved } = dedupeElementSets(inWindow);
  counts.duplicatesRemoved = duplicatesRemoved;

  const points: TrendPoint[] = unique.map((s) => {
    const d = deriveElementSet(s);
    return {
      catalogNumber: s.catalogNumber,
      epochMs: s.epochMs,
      epoch: s.epoch,
      elementSetNo: s.elementSetNo,
      sourceLine: s.sourceLine,
      bstar: s.bstar,
      semiMajorAxisKm: d.semiMajorAxisKm,
      apogeeAltitudeKm: d.apogeeAltitudeKm,
      perigeeAltitudeKm: d.perigeeAltitudeKm,
      meanAltitudeKm: d.meanAltitudeKm,
      periodMin: d.periodMin,
      specificEnergyJPerKg: d.specificEnergyJPerKg,
      decayRateKmPerDay: d.decayRateKmPerDay,
      outlier: false,
      outlierScore: 0,
    };
  });
  const base = {
    catalogNumber,
    points,
    counts,
    fromMs: opts.fromMs ?? null,
    toMs: opts.toMs ?? null,
    spanDays: points.length ? (points[points.length - 1]!.epochMs - points[0]!.epochMs) / 86_400_000 : 0,
  };
  const fit = fitTrendSamples(points, opts.outlierThreshold);
  counts.outliers = fit.outliers;
  counts.used = fit.used;
  return { ...base, rates: fit.rates, intervals: fit.intervals };
}

/** What the outlier screen and the rate fits read and write of a point; a TrendPoint has all of it. */
export type TrendSample = {
  epochMs: number;
  semiMajorAxisKm: number;
  apogeeAltitudeKm: number;
  perigeeAltitudeKm: number;
  specificEnergyJPerKg: number;
  outlier: boolean;
  outlierScore: number;
};

/**
 * The outlier screen and the rates of computeTrend over points already of one object, de-duplicated and sorted by
 * epoch, with their derived values (for instance as stored at import): sets `outlier` and `outlierScore` on each.
 */
export function fitTrendSamples(
  points: TrendSample[],
  outlierThreshold = 3.5,
): Pick<Trend, 'rates' | 'intervals'> & { outliers: number; used: number } {
  if (points.length < 3) return { rates: null, intervals: null, outliers: 0, used: points.length };
  const t0 = points[0]!.epochMs;
  const xDays = Float64Array.from(points, (p) => (p.epochMs - t0) / 86_400_000);
  const threshold = outlierThreshold;
  const screenKeys = ['semiMajorAxisKm', 'perigeeAltitudeKm'] as const;
  const screenY = screenKeys.map((key) => Float64Array.from(points, (p) => p[key]));
  // One pass over the pairs for both screening fits (theilSenMany gives each what theilSen would).
  theilSenMany(xDays, screenY).forEach((fit, k) => {
    if (!fit) return;
    const y = screenY[k]!;
    const resid = Float64Array.from(y, (v, i) => v - (fit.intercept + fit.slope * xDays[i]!));
    const z = modifiedZ(resid);
    points.forEach((p, i) => {
      p.outlierScore = Math.max(p.outlierScore, z[i]!);
    });
  });
  for (const p of points) p.outlier = p.outlierScore > threshold;
  const good = points.filter((p) => !p.outlier);
  const tally = { outliers: points.length - good.length, used: good.length };
  if (good.length < 2) return { rates: null, intervals: null, ...tally };
  const gx = Float64Array.from(good, (p) => (p.epochMs - t0) / 86_400_000);
  const rateKeys = ['apogeeAltitudeKm', 'perigeeAltitudeKm', 'semiMajorAxisKm', 'specificEnergyJPerKg'] as const;
  const [apo, peri, sma, energy] = theilSenMany(
    gx,
    rateKeys.map((key) => Float64Array.from(good, (p) => p[key])),
  );
  if (!apo || !peri || !sma || !energy) return { rates: null, intervals: null, ...tally };
  const aMedianKm = median(Float64Array.from(good, (p) => p.semiMajorAxisKm));
  const mu = MU_WGS72_KM3_PER_S2 * 1e9;
  const accel = (v: number) => alongTrackAccelerationMPerS2(v, aMedianKm, mu);
  return {
    ...tally,
    rates: {
      apogeeKmPerDay: apo.slope,
      perigeeKmPerDay: peri.slope,
      semiMajorAxisKmPerDay: sma.slope,
      energyJPerKgPerDay: energy.slope,
      alongTrackAccelMPerS2: accel(energy.slope),
    },
    intervals: {
      apogeeKmPerDay: [apo.slopeLow, apo.slopeHigh],
      perigeeKmPerDay: [peri.slopeLow, peri.slopeHigh],
      semiMajorAxisKmPerDay: [sma.slopeLow, sma.slopeHigh],
      energyJPerKgPerDay: [energy.slopeLow, energy.slopeHigh],
      alongTrackAccelMPerS2: [accel(energy.slopeLow), accel(energy.slopeHigh)],
    },
  };
}
