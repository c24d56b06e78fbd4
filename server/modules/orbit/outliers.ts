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
    while (j >= 0 && a[j]! > v) {
      a[j + 1] = a[j]!;
      j--;
    }
    a[j + 1] = v;
  }
  const m = n >> 1;
  return n % 2 ? a[m]! : (a[m - 1]! + a[m]!) / 2;
}

const idx = new Int32Array(16);

/** Theil–Sen line through points lo…hi of (t, y) (inclusive, `skip` left out), evaluated at t0. */
function predictAt(t: Float64Array, y: Float64Array, lo: number, hi: number, skip: number, t0: number): number {
  let n = 0;
  const last = Math.min(t.length - 1, hi);
  for (let j = Math.max(0, lo); j <= last; j++) if (j !== skip) idx[n++] = j;
  if (n < 2) return NaN;
  let c = 0;
  for (let a = 0; a < n; a++) {
    const ia = idx[a]!;
    const ta = t[ia]!,
      ya = y[ia]!;
    for (let b = a + 1; b < n; b++) {
      const ib = idx[b]!;
      const dx = t[ib]! - ta;
      if (dx !== 0) slopes[c++] = ((y[ib]! - ya) * 86_400_000) / dx;
    }
  }
  if (c === 0) return NaN;
  const slope = medianInPlace(slopes, c);
  for (let a = 0; a < n; a++) {
    const ia = idx[a]!;
    offsets[a] = y[ia]! - (slope * (t[ia]! - t0)) / 86_400_000;
  }
  return medianInPlace(offsets, n);
}

/** Sets between pauses of the stepped computation (a few milliseconds of work). */
const STEP = 4096;

/**
 * The residual from the closest of three local lines: both sides, left only, right only. Where a sail mode changes
 * the trend bends; a one-sided line still follows it there, while a bad fit is far from all three.
 */
function closestResidual(t: Float64Array, y: Float64Array, i: number, both: number): number {
  const t0 = t[i]!,
    yi = y[i]!;
  let best = both;
  for (const d of [yi - predictAt(t, y, i - NEIGHBOURS - 1, i - 1, -1, t0), yi - predictAt(t, y, i + 1, i + NEIGHBOURS + 1, -1, t0)]) {
    if (Number.isFinite(d) && !(Math.abs(d) >= Math.abs(best))) best = d;
  }
  return best;
}

/**
 * The outlier screen, pausing (yield) every few thousand sets so that an import can run it while its COPY streams:
 * flagOutliers runs it straight through, flagOutliersInTurns gives the event loop a turn at each pause.
 */
function* outlierSteps(input: readonly OutlierInput[]): Generator<void, Set<number>> {
  const points = [...input].sort((a, b) => a.epochMs - b.epochMs);
  const out = new Set<number>();
  if (points.length < MIN_POINTS) return out;
  // Plain arrays of the sorted values: the neighbourhood fits read them 2 × ~50 times per set.
  const t = Float64Array.from(points, (p) => p.epochMs);
  const ys = [Float64Array.from(points, (p) => p.semiMajorAxisKm), Float64Array.from(points, (p) => p.perigeeAltitudeKm)];
  const residuals = ys.map(() => new Float64Array(t.length));
  for (let i0 = 0; i0 < t.length; i0 += STEP) {
    const i1 = Math.min(t.length, i0 + STEP);
    ys.forEach((y, k) => {
      const r = residuals[k]!;
      for (let i = i0; i < i1; i++) r[i] = y[i]! - predictAt(t, y, i - NEIGHBOURS, i + NEIGHBOURS, i, t[i]!);
    });
    yield;
  }
  let start = 0;
  while (start < points.length) {
    const bin = binOf(t[start]!);
    let end = start;
    while (end < points.length && binOf(t[end]!) === bin) end++;
    if (end - start >= MIN_POINTS) {
      ys.forEach((y, k) => {
        // The scale comes from the two-sided residuals; only a set that looks bad against them is tried against the one-sided lines.
        const r = residuals[k]!;
        const slice = r.subarray(start, end).filter(Number.isFinite);
        const m = median(slice);
        const mad = Math.max(medianAbsoluteDeviation(slice, m), MAD_FLOOR_KM);
        const z = (v: number) => Math.abs((0.6745 * (v - m)) / mad);
        for (let i = start; i < end; i++) {
          if (!(z(r[i]!) > THRESHOLD) && Number.isFinite(r[i]!)) continue;
          if (z(closestResidual(t, y, i, r[i]!)) > THRESHOLD) out.add(points[i]!.id);
        }
      });
      yield;
    }
    start = end;
  }
  return out;
}

/** Ids of the outliers among `points`; a bin with fewer than nine sets flags nothing. */
export function flagOutliers(input: readonly OutlierInput[]): Set<number> {
  const steps = outlierSteps(input);
  for (;;) {
    const s = steps.next();
    if (s.done) return s.value;
  }
}

/** flagOutliers, letting other work (a streaming COPY) run between its steps. */
export async function flagOutliersInTurns(input: readonly OutlierInput[]): Promise<Set<number>> {
  const steps = outlierSteps(input);
  for (;;) {
    const s = steps.next();
    if (s.done) return s.value;
    await new Promise<void>((resolve) => setImmediate(resolve));
  }
}
