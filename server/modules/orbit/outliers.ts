import { median, medianAbsoluteDeviation, theilSen } from '../../../shared/orbit/robust-stats';

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

function predictAt(points: readonly OutlierInput[], key: 'semiMajorAxisKm' | 'perigeeAltitudeKm', idx: number[], t0: number): number {
  if (idx.length < 2) return NaN;
  const fit = theilSen(Float64Array.from(idx, (j) => (points[j]!.epochMs - t0) / 86_400_000), Float64Array.from(idx, (j) => points[j]![key]));
  return fit ? fit.intercept : NaN;
}

/**
 * Residual from the closest of three local lines: through the neighbours on both sides, on the left only and on
 * the right only. Where a sail mode changes the trend bends; one of the one-sided lines still follows it there,
 * while a bad fit is far from all three.
 */
function localResiduals(points: readonly OutlierInput[], key: 'semiMajorAxisKm' | 'perigeeAltitudeKm') {
  const n = points.length;
  const r = new Float64Array(n);
  const twoSided = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const t0 = points[i]!.epochMs;
    const left: number[] = [], right: number[] = [];
    for (let j = i - 1; j >= 0 && left.length < NEIGHBOURS + 1; j--) left.push(j);
    for (let j = i + 1; j < n && right.length < NEIGHBOURS + 1; j++) right.push(j);
    const both = [...left.slice(0, NEIGHBOURS), ...right.slice(0, NEIGHBOURS)];
    const y = points[i]![key];
    let best = NaN;
    twoSided[i] = y - predictAt(points, key, both, t0);
    for (const idx of [both, left, right]) {
      const d = y - predictAt(points, key, idx, t0);
      if (Number.isFinite(d) && !(Math.abs(d) >= Math.abs(best))) best = d;
    }
    r[i] = best;
  }
  return { closest: r, twoSided };
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
        // The scale comes from the two-sided residuals; the test uses the closest line's residual.
        const slice = r.twoSided.subarray(start, end).filter(Number.isFinite);
        const m = median(slice);
        const mad = Math.max(medianAbsoluteDeviation(slice, m), MAD_FLOOR_KM);
        for (let i = start; i < end; i++) if (Math.abs((0.6745 * (r.closest[i]! - m)) / mad) > THRESHOLD) out.add(points[i]!.id);
      }
    }
    start = end;
  }
  return out;
}
