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

/**
 * Theil–Sen line through (x, y). Up to ~900 points every pair is used; above that a deterministic sample of
 * pairs (fixed-seed generator) keeps the cost bounded.
 */
export function theilSen(x: ArrayLike<number>, y: ArrayLike<number>): TheilSenFit | null {
  const n = Math.min(x.length, y.length);
  if (n < 2) return null;
  const total = (n * (n - 1)) / 2;
  let slopes: Float64Array;
  let count = 0;
  if (total <= MAX_PAIRS) {
    slopes = new Float64Array(total);
    for (let i = 0; i < n; i++) {
      const xi = x[i]!, yi = y[i]!;
      for (let j = i + 1; j < n; j++) {
        const dx = x[j]! - xi;
        if (dx !== 0) slopes[count++] = (y[j]! - yi) / dx;
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
      if (dx !== 0) slopes[count++] = (y[j]! - y[i]!) / dx;
    }
  }
  if (count === 0) return null;
  const s = slopes.subarray(0, count).sort();
  const mid = count >> 1;
  const slope = count % 2 ? s[mid]! : (s[mid - 1]! + s[mid]!) / 2;
  const resid0 = new Float64Array(n);
  for (let i = 0; i < n; i++) resid0[i] = y[i]! - slope * x[i]!;
  const intercept = median(resid0);
  // Sen (1968): C = z·√(n(n−1)(2n+5)/18) ranks either side of the median, scaled to the sampled pair count.
  const c = 1.96 * Math.sqrt((n * (n - 1) * (2 * n + 5)) / 18) * (count / total);
  const lowRank = Math.max(0, Math.floor((count - c) / 2));
  const highRank = Math.min(count - 1, Math.ceil((count + c) / 2));
  let xm = 0;
  for (let i = 0; i < n; i++) xm += x[i]!;
  xm /= n;
  let sxx = 0;
  for (let i = 0; i < n; i++) sxx += (x[i]! - xm) ** 2;
  for (let i = 0; i < n; i++) resid0[i] = y[i]! - (intercept + slope * x[i]!);
  const residualSigma = MAD_TO_SIGMA * medianAbsoluteDeviation(resid0, 0);
  return {
    slope, intercept, slopeLow: s[lowRank]!, slopeHigh: s[highRank]!, pairCount: count, residualSigma,
    slopeStandardError: sxx > 0 ? residualSigma / Math.sqrt(sxx) : Infinity,
  };
}
