import { median, medianAbsoluteDeviation } from '../../../shared/orbit/robust-stats';

// Outliers by the engine's rule — modified z-score above 3.5 (Iglewicz & Hoaglin 1993) — on the residuals of
// semi-major axis and perigee. The baseline is local: Theil–Sen lines through the sets next to each set (the set
// itself left out), because one line per window cannot follow the kinks where sail modes change.
// The z-score scale (median and MAD of the residuals) is taken per 30-day bin; bins let an import re-check only
// the part of the history it touched.
export const OUTLIER_BIN_MS = 30 * 86_400_000;
const THRESHOLD = 3.5;
const NEIGHBOURS = 4;
const MAD_FLOOR_KM = 1e-3;
const MIN_POINTS = 2 * NEIGHBOURS + 1;

export type OutlierInput = { id: number; epochMs: number; semiMajorAxisKm: number; perigeeAltitudeKm: number };

export const binOf = (epochMs: number) => Math.floor(epochMs / OUTLIER_BIN_MS);

const slopes = new Float64Array(64);
const offsets = new Float64Array(16);

function medianInPlace(a: Float64Array, n: number): number {
  // Insertion sort: the neighbourhoods hold at most ten points (45 pairs).
  for (let i = 1; i < n; i++) {
    const v = a[i]!;
    let j = i - 1;
    while (j >= 0 && a[j]! > v) { a[j + 1] = a[j]!; j--; }
    a[j + 1] = v;
  }
  const m = n >> 1;
  return n % 2 ? a[m]! : (a[m - 1]! + a[m]!) / 2;
}

const idx = new Int32Array(16);

/** Theil–Sen line through points lo…hi (inclusive, `skip` left out), evaluated at t0. */
function predictAt(points: readonly OutlierInput[], key: 'semiMajorAxisKm' | 'perigeeAltitudeKm', lo: number, hi: number, skip: number, t0: number): number {
  let n = 0;
  for (let j = Math.max(0, lo); j <= Math.min(points.length - 1, hi); j++) if (j !== skip) idx[n++] = j;
  if (n < 2) return NaN;
  let c = 0;
  for (let a = 0; a < n; a++) {
    const pa = points[idx[a]!]!;
    for (let b = a + 1; b < n; b++) {
      const pb = points[idx[b]!]!;
      const dx = pb.epochMs - pa.epochMs;
      if (dx !== 0) slopes[c++] = ((pb[key] - pa[key]) * 86_400_000) / dx;
    }
  }
  if (c === 0) return NaN;
  const slope = medianInPlace(slopes, c);
  for (let a = 0; a < n; a++) {
    const p = points[idx[a]!]!;
    offsets[a] = p[key] - (slope * (p.epochMs - t0)) / 86_400_000;
  }
  return medianInPlace(offsets, n);
}

function twoSidedResiduals(points: readonly OutlierInput[], key: 'semiMajorAxisKm' | 'perigeeAltitudeKm'): Float64Array {
  const r = new Float64Array(points.length);
  for (let i = 0; i < points.length; i++) r[i] = points[i]![key] - predictAt(points, key, i - NEIGHBOURS, i + NEIGHBOURS, i, points[i]!.epochMs);
  return r;
}

/**
 * The residual from the closest of three local lines: both sides, left only, right only. Where a sail mode changes
 * the trend bends; a one-sided line still follows it there, while a bad fit is far from all three.
 */
function closestResidual(points: readonly OutlierInput[], key: 'semiMajorAxisKm' | 'perigeeAltitudeKm', i: number, both: number): number {
  const t0 = points[i]!.epochMs, y = points[i]![key];
  let best = both;
  for (const d of [y - predictAt(points, key, i - NEIGHBOURS - 1, i - 1, -1, t0), y - predictAt(points, key, i + 1, i + NEIGHBOURS + 1, -1, t0)]) {
    if (Number.isFinite(d) && !(Math.abs(d) >= Math.abs(best))) best = d;
  }
  return best;
}

/** Ids of the outliers among `points`; a bin with fewer than nine sets flags nothing. */
export function flagOutliers(input: readonly OutlierInput[]): Set<number> {
  const points = [...input].sort((a, b) => a.epochMs - b.epochMs);
  const out = new Set<number>();
  if (points.length < MIN_POINTS) return out;
  const keys = ['semiMajorAxisKm', 'perigeeAltitudeKm'] as const;
  const residuals = keys.map((k) => twoSidedResiduals(points, k));
  let start = 0;
  while (start < points.length) {
    const bin = binOf(points[start]!.epochMs);
    let end = start;
    while (end < points.length && binOf(points[end]!.epochMs) === bin) end++;
    if (end - start >= MIN_POINTS) {
      keys.forEach((key, k) => {
        // The scale comes from the two-sided residuals; only a set that looks bad against them is tried against the one-sided lines.
        const r = residuals[k]!;
        const slice = r.subarray(start, end).filter(Number.isFinite);
        const m = median(slice);
        const mad = Math.max(medianAbsoluteDeviation(slice, m), MAD_FLOOR_KM);
        const z = (v: number) => Math.abs((0.6745 * (v - m)) / mad);
        for (let i = start; i < end; i++) {
          if (!(z(r[i]!) > THRESHOLD) && Number.isFinite(r[i]!)) continue;
          if (z(closestResidual(points, key, i, r[i]!)) > THRESHOLD) out.add(points[i]!.id);
        }
      });
    }
    start = end;
  }
  return out;
}
