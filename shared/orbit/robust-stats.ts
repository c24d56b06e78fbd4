// Robust statistics: median, MAD, Theil–Sen slope (Sen 1968) with its rank-based 95 % interval.

export function median(values: ArrayLike<number>): number {
  const n = values.length;
  if (n === 0) return NaN;
  const s = Float64Array.from(values as ArrayLike<number>).sort();
  const m = n >> 1;
  return n % 2 ? s[m]! : (s[m - 1]! + s[m]!) / 2;
}

/** Median absolute deviation from the median (unscaled). */
export function medianAbsoluteDeviation(values: ArrayLike<number>, center = median(values)): number {
  const d = new Float64Array(values.length);
  for (let i = 0; i < values.length; i++) d[i] = Math.abs(values[i]! - center);
  return median(d);
}

/** 1.4826·MAD estimates σ for normal data. */
export const MAD_TO_SIGMA = 1.4826;

export type TheilSenFit = {
  slope: number;
  intercept: number;
  /** 95 % interval of the slope from the ranks of the pairwise slopes (normal approximation). */
  slopeLow: number;
  slopeHigh: number;
  pairCount: number;
  /** Robust σ of the residuals (1.4826·MAD). */
  residualSigma: number;
  /** Slope standard error from the residual scatter: σ / √Σ(x − x̄)². */
  slopeStandardError: number;
};

const MAX_PAIRS = 400_000;

/** Float64Array.prototype.sort's order: −0 before +0 (NaN is kept out of the selection by the caller). */
function before(a: number, b: number): boolean {
  return a < b || (a === 0 && b === 0 && 1 / a < 0 && 1 / b > 0);
}

/**
 * Moves the value of rank k (0-based, in sort order) of a[lo…hi] to a[k], smaller ones before it and larger after
 * (Hoare's selection, median-of-three pivot): the order statistics a sort would give, in linear expected time.
 */
function selectRank(a: Float64Array, lo: number, hi: number, k: number): number {
  while (hi > lo) {
    const mid = lo + ((hi - lo) >> 1);
    // Median of three into a[mid] as the pivot.
    if (before(a[mid]!, a[lo]!)) { const t = a[mid]!; a[mid] = a[lo]!; a[lo] = t; }
    if (before(a[hi]!, a[lo]!)) { const t = a[hi]!; a[hi] = a[lo]!; a[lo] = t; }
    if (before(a[hi]!, a[mid]!)) { const t = a[hi]!; a[hi] = a[mid]!; a[mid] = t; }
    const pivot = a[mid]!;
    let i = lo, j = hi;
    while (i <= j) {
      while (before(a[i]!, pivot)) i++;
      while (before(pivot, a[j]!)) j--;
      if (i <= j) { const t = a[i]!; a[i] = a[j]!; a[j] = t; i++; j--; }
    }
    if (k <= j) hi = j;
    else if (k >= i) lo = i;
    else return a[k]!;
  }
  return a[k]!;
}

/**
 * Theil–Sen line through (x, y). Up to ~900 points every pair is used; above that a deterministic sample of
 * pairs (fixed-seed generator) keeps the cost bounded — the common practice for large n — and the 95 % interval
 * is Sen's rank interval scaled to the sampled pairs. The median and the interval ends are order statistics of the
 * pairwise slopes, picked by selection (linear) rather than a full sort (n log n): the same values a sort gives.
 */
export function theilSen(x: ArrayLike<number>, y: ArrayLike<number>): TheilSenFit | null {
  const n = Math.min(x.length, y.length);
  if (n < 2) return null;
  const total = (n * (n - 1)) / 2;
  let slopes: Float64Array;
  // Finite-or-infinite slopes are gathered at the front; NaN ones (only from non-finite y) rank last, as in a sort.
  let count = 0;
  let nans = 0;
  if (total <= MAX_PAIRS) {
    slopes = new Float64Array(total);
    for (let i = 0; i < n; i++) {
      const xi = x[i]!, yi = y[i]!;
      for (let j = i + 1; j < n; j++) {
        const dx = x[j]! - xi;
        if (dx !== 0) {
          const v = (y[j]! - yi) / dx;
          if (v === v) slopes[count++] = v;
          else nans++;
        }
      }
    }
  } else {
    slopes = new Float64Array(MAX_PAIRS);
    let seed = 0x9e3779b9;
    const rand = () => {
      seed ^= seed << 13; seed >>>= 0;
      seed ^= seed >>> 17;
      seed ^= seed << 5; seed >>>= 0;
      return seed / 4294967296;
    };
    for (let k = 0; k < MAX_PAIRS; k++) {
      const i = Math.floor(rand() * n), j = Math.floor(rand() * n);
      const dx = x[j]! - x[i]!;
      if (dx !== 0) {
        const v = (y[j]! - y[i]!) / dx;
        if (v === v) slopes[count++] = v;
        else nans++;
      }
    }
  }
  const finite = count;
  count += nans;
  if (count === 0) return null;
  const s = slopes.subarray(0, count);
  s.fill(NaN, finite);
  const mid = count >> 1;
  // Rank r of the sorted slopes; each call leaves s partitioned around r, so later picks search one side only.
  let upper = mid < finite ? selectRank(s, 0, finite - 1, mid) : NaN;
  let lower = NaN;
  if (count % 2 === 0) {
    if (mid - 1 < finite) {
      if (mid < finite) {
        // Rank mid − 1 is the largest of s[0…mid − 1].
        lower = s[0]!;
        for (let k = 1; k < mid; k++) if (before(lower, s[k]!)) lower = s[k]!;
      } else lower = selectRank(s, 0, finite - 1, mid - 1);
    }
  }
  const slope = count % 2 ? upper : (lower + upper) / 2;
  const resid0 = new Float64Array(n);
  for (let i = 0; i < n; i++) resid0[i] = y[i]! - slope * x[i]!;
  const intercept = median(resid0);
  // Sen (1968): C = z·√(n(n−1)(2n+5)/18) ranks either side of the median, scaled to the sampled pair count.
  const c = 1.96 * Math.sqrt((n * (n - 1) * (2 * n + 5)) / 18) * (count / total);
  const lowRank = Math.max(0, Math.floor((count - c) / 2));
  const highRank = Math.min(count - 1, Math.ceil((count + c) / 2));
  const rankOf = (r: number, lo: number, hi: number) => (r < finite ? selectRank(s, lo, Math.min(hi, finite - 1), r) : NaN);
  // lowRank ≤ mid ≤ highRank: the selections above left everything below rank mid in s[0…mid − 1], the rest after.
  const slopeLow = lowRank === mid ? upper : lowRank < mid ? rankOf(lowRank, 0, mid - 1) : rankOf(lowRank, mid, count - 1);
  const slopeHigh = highRank === mid ? upper : highRank > mid ? rankOf(highRank, mid + 1, count - 1) : rankOf(highRank, 0, mid - 1);
  upper = 0; // only the values above are used from here on
  let xm = 0;
  for (let i = 0; i < n; i++) xm += x[i]!;
  xm /= n;
  let sxx = 0;
  for (let i = 0; i < n; i++) sxx += (x[i]! - xm) ** 2;
  for (let i = 0; i < n; i++) resid0[i] = y[i]! - (intercept + slope * x[i]!);
  const residualSigma = MAD_TO_SIGMA * medianAbsoluteDeviation(resid0, 0);
  return {
    slope, intercept, slopeLow, slopeHigh, pairCount: count, residualSigma,
    slopeStandardError: sxx > 0 ? residualSigma / Math.sqrt(sxx) : Infinity,
  };
}
