import { median, medianAbsoluteDeviation, theilSen } from '../../../shared/orbit/robust-stats';

// The orbit engine's outlier rule (modified z-score of Theil–Sen residuals of semi-major axis and perigee,
// Iglewicz & Hoaglin 1993, |z| > 3.5) applied per 30-day bin: one straight line cannot follow a history
// with raising periods, and fixed calendar bins let an import re-check only the bins it touched.
export const OUTLIER_BIN_MS = 30 * 86_400_000;
const THRESHOLD = 3.5;
const MAD_FLOOR_KM = 1e-3;
const MIN_POINTS = 5;

export type OutlierInput = { id: number; epochMs: number; semiMajorAxisKm: number; perigeeAltitudeKm: number };

export const binOf = (epochMs: number) => Math.floor(epochMs / OUTLIER_BIN_MS);

function scores(x: Float64Array, y: Float64Array, into: Float64Array) {
  const fit = theilSen(x, y);
  if (!fit) return;
  const r = new Float64Array(x.length);
  for (let i = 0; i < x.length; i++) r[i] = y[i]! - (fit.intercept + fit.slope * x[i]!);
  const m = median(r);
  const mad = Math.max(medianAbsoluteDeviation(r, m), MAD_FLOOR_KM);
  for (let i = 0; i < x.length; i++) into[i] = Math.max(into[i]!, Math.abs((0.6745 * (r[i]! - m)) / mad));
}

/** Ids of the outliers among `points` (any order); bins with fewer than five sets flag nothing. */
export function flagOutliers(points: readonly OutlierInput[]): Set<number> {
  const bins = new Map<number, OutlierInput[]>();
  for (const p of points) {
    const b = binOf(p.epochMs);
    let list = bins.get(b);
    if (!list) bins.set(b, (list = []));
    list.push(p);
  }
  const out = new Set<number>();
  for (const list of bins.values()) {
    if (list.length < MIN_POINTS) continue;
    const t0 = list[0]!.epochMs;
    const x = Float64Array.from(list, (p) => (p.epochMs - t0) / 86_400_000);
    const z = new Float64Array(list.length);
    scores(x, Float64Array.from(list, (p) => p.semiMajorAxisKm), z);
    scores(x, Float64Array.from(list, (p) => p.perigeeAltitudeKm), z);
    for (let i = 0; i < list.length; i++) if (z[i]! > THRESHOLD) out.add(list[i]!.id);
  }
  return out;
}
