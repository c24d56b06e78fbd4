import { median, medianAbsoluteDeviation, theilSen } from '../../../shared/orbit/robust-stats';

// Outliers by the engine's rule — modified z-score above 3.5 (Iglewicz & Hoaglin 1993) — on the residuals of
// semi-major axis and perigee. The baseline is local: a Theil–Sen line through the four sets either side of each
// set (the set itself left out), because one line per window cannot follow the kinks where sail modes change.
// The z-score scale (median and MAD of the residuals) is taken per 30-day bin; bins let an import re-check only
// the part of the history it touched.
export const OUTLIER_BIN_MS = 30 * 86_400_000;
const THRESHOLD = 3.5;
const NEIGHBOURS = 4;
const MAD_FLOOR_KM = 1e-3;
const MIN_POINTS = 2 * NEIGHBOURS + 1;

export type OutlierInput = { id: number; epochMs: number; semiMajorAxisKm: number; perigeeAltitudeKm: number };

export const binOf = (epochMs: number) => Math.floor(epochMs / OUTLIER_BIN_MS);

function localResiduals(points: readonly OutlierInput[], key: 'semiMajorAxisKm' | 'perigeeAltitudeKm'): Float64Array {
  const n = points.length;
  const r = new Float64Array(n);
  const x = new Float64Array(2 * NEIGHBOURS);
  const y = new Float64Array(2 * NEIGHBOURS);
  for (let i = 0; i < n; i++) {
    let lo = Math.max(0, i - NEIGHBOURS);
    let hi = Math.min(n - 1, i + NEIGHBOURS);
    // Keep the neighbourhood full at the ends of the history.
    if (hi - lo < 2 * NEIGHBOURS) {
      if (lo === 0) hi = Math.min(n - 1, 2 * NEIGHBOURS);
      else lo = Math.max(0, n - 1 - 2 * NEIGHBOURS);
    }
    let m = 0;
    const t0 = points[i]!.epochMs;
    for (let j = lo; j <= hi; j++) {
      if (j === i) continue;
      x[m] = (points[j]!.epochMs - t0) / 86_400_000;
      y[m] = points[j]![key];
      m++;
    }
    const fit = theilSen(x.subarray(0, m), y.subarray(0, m));
    r[i] = fit ? points[i]![key] - fit.intercept : NaN;
  }
  return r;
}

/** Ids of the outliers among `points`; a bin with fewer than nine sets flags nothing. */
export function flagOutliers(input: readonly OutlierInput[]): Set<number> {
  const points = [...input].sort((a, b) => a.epochMs - b.epochMs);
  const out = new Set<number>();
  if (points.length < MIN_POINTS) return out;
  const residuals = [localResiduals(points, 'semiMajorAxisKm'), localResiduals(points, 'perigeeAltitudeKm')];
  let start = 0;
  while (start < points.length) {
    const bin = binOf(points[start]!.epochMs);
    let end = start;
    while (end < points.length && binOf(points[end]!.epochMs) === bin) end++;
    if (end - start >= MIN_POINTS) {
      for (const r of residuals) {
        const slice = r.subarray(start, end).filter(Number.isFinite);
        const m = median(slice);
        const mad = Math.max(medianAbsoluteDeviation(slice, m), MAD_FLOOR_KM);
        for (let i = start; i < end; i++) if (Math.abs((0.6745 * (r[i]! - m)) / mad) > THRESHOLD) out.add(points[i]!.id);
      }
    }
    start = end;
  }
  return out;
}
