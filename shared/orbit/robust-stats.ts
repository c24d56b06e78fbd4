// Robust statistics: median, MAD, Theil–Sen slope (Sen 1968) with its rank-based 95 % interval.

export function median(values: ArrayLike<number>): number {
  const n = values.length;
  if (n === 0) return NaN;
  const s = Float64Array.from(values).sort();
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

type Pairs = { i: Int32Array; j: Int32Array; dx: Float64Array; count: number };

/**
 * The pairs the slopes are taken over: every pair with distinct x up to MAX_PAIRS of them, above that a deterministic
 * sample (xorshift32 from a fixed seed, so the same pairs every time for the same n).
 */
function pairsOf(x: ArrayLike<number>, n: number): Pairs {
  const total = (n * (n - 1)) / 2;
  const size = total <= MAX_PAIRS ? total : MAX_PAIRS;
  const pi = new Int32Array(size),
    pj = new Int32Array(size),
    pdx = new Float64Array(size);
  let c = 0;
  if (total <= MAX_PAIRS) {
    for (let i = 0; i < n; i++) {
      const xi = x[i]!;
      for (let j = i + 1; j < n; j++) {
        const dx = x[j]! - xi;
        if (dx !== 0) {
          pi[c] = i;
          pj[c] = j;
          pdx[c++] = dx;
        }
      }
    }
  } else {
    // xorshift32 kept in int32 arithmetic (a local small integer, no boxed doubles): the same bits as the unsigned form.
    let seed = 0x9e3779b9 | 0;
    for (let k = 0; k < MAX_PAIRS; k++) {
      seed ^= seed << 13;
      seed ^= seed >>> 17;
      seed ^= seed << 5;
      const i = Math.floor(((seed >>> 0) / 4294967296) * n);
      seed ^= seed << 13;
      seed ^= seed >>> 17;
      seed ^= seed << 5;
      const j = Math.floor(((seed >>> 0) / 4294967296) * n);
      const dx = x[j]! - x[i]!;
      if (dx !== 0) {
        pi[c] = i;
        pj[c] = j;
        pdx[c++] = dx;
      }
    }
  }
  return { i: pi, j: pj, dx: pdx, count: c };
}

/** Float64Array.prototype.sort's order on non-NaN values: −0 before +0. */
function before(a: number, b: number): boolean {
  return a < b || (a === 0 && b === 0 && 1 / a < 0 && 1 / b > 0);
}

/**
 * Moves the value of rank k (0-based, in sort order) of a[lo…hi] to a[k], no larger ones before it and no smaller
 * after (Hoare's selection with a median-of-three pivot; a holds no NaN).
 */
function selectRank(a: Float64Array, lo: number, hi: number, k: number): void {
  while (hi > lo) {
    const mid = lo + ((hi - lo) >> 1);
    if (before(a[mid]!, a[lo]!)) {
      const t = a[mid]!;
      a[mid] = a[lo]!;
      a[lo] = t;
    }
    if (before(a[hi]!, a[lo]!)) {
      const t = a[hi]!;
      a[hi] = a[lo]!;
      a[lo] = t;
    }
    if (before(a[hi]!, a[mid]!)) {
      const t = a[hi]!;
      a[hi] = a[mid]!;
      a[mid] = t;
    }
    const pivot = a[mid]!;
    let i = lo,
      j = hi;
    while (i <= j) {
      while (before(a[i]!, pivot)) i++;
      while (before(pivot, a[j]!)) j--;
      if (i <= j) {
        const t = a[i]!;
        a[i] = a[j]!;
        a[j] = t;
        i++;
        j--;
      }
    }
    if (k <= j) hi = j;
    else if (k >= i) lo = i;
    else return;
  }
}

/** Values of the ascending ranks[from…to] of a[lo…hi] into out, selecting the middle one first and splitting there. */
function selectRanks(a: Float64Array, lo: number, hi: number, ranks: readonly number[], from: number, to: number, out: number[]): void {
  if (from > to) return;
  const m = (from + to) >> 1,
    k = ranks[m]!;
  selectRank(a, lo, hi, k);
  out[m] = a[k]!;
  selectRanks(a, lo, k - 1, ranks, from, m - 1, out);
  selectRanks(a, k + 1, hi, ranks, m + 1, to, out);
}

const SAMPLE = 4096;

/**
 * Values of the given ascending ranks (0-based) of the sorted pairwise slopes, without sorting them all: the ranks
 * needed (the median and Sen's interval) sit in a narrow band. A sample of the slopes bounds that band; one pass
 * counts the slopes below it and keeps those inside, and the ranks are selected among the kept ones. The bounds
 * are inclusive, so ties at a bound are all kept, and the selection orders −0 before +0 as a sort does; should the
 * band miss a wanted rank, every slope is sorted instead. Either way the values are exactly those of a full sort.
 */
function slopeRanks(y: Float64Array, p: Pairs, ranks: readonly number[]): number[] {
  const count = p.count;
  const { i: pi, j: pj, dx } = p;
  const lo = ranks[0]!,
    hi = ranks[ranks.length - 1]!;
  if (count > 8 * SAMPLE) {
    const stride = Math.floor(count / SAMPLE);
    const sample = new Float64Array(SAMPLE);
    for (let q = 0; q < SAMPLE; q++) {
      const k = q * stride;
      sample[q] = (y[pj[k]!]! - y[pi[k]!]!) / dx[k]!;
    }
    sample.sort();
    // Sample positions of the wanted ranks, widened by 5 standard deviations of a sample quantile (σ ≤ √m / 2).
    const margin = Math.ceil(2.5 * Math.sqrt(SAMPLE)) + 2;
    const a = Math.floor((lo / count) * SAMPLE) - margin,
      b = Math.ceil((hi / count) * SAMPLE) + margin;
    if (a > 0 && b < SAMPLE - 1) {
      const lowBound = sample[a]!,
        highBound = sample[b]!;
      if (lowBound === lowBound && highBound === highBound) {
        // Branch-free: every slope is written at the next free place, which moves on only for one inside the band
        // (NaN is in neither count). A store past the end is dropped by the typed array; kept then tells.
        const band = new Float64Array(Math.min(count, 4 * (b - a) * stride + 1024));
        let below = 0,
          kept = 0;
        for (let k = 0; k < count; k++) {
          const v = (y[pj[k]!]! - y[pi[k]!]!) / dx[k]!;
          band[kept] = v;
          const under = +(v < lowBound);
          below += under;
          kept += +(v <= highBound) - under;
        }
        if (kept < band.length && below <= lo && hi < below + kept) {
          const out: number[] = [];
          selectRanks(
            band,
            0,
            kept - 1,
            ranks.map((r) => r - below),
            0,
            ranks.length - 1,
            out,
          );
          return out;
        }
      }
    }
  }
  const all = new Float64Array(count);
  for (let k = 0; k < count; k++) all[k] = (y[pj[k]!]! - y[pi[k]!]!) / dx[k]!;
  all.sort();
  return ranks.map((r) => all[r]!);
}

function fitOverPairs(x: ArrayLike<number>, yIn: ArrayLike<number>, n: number, p: Pairs): TheilSenFit | null {
  const count = p.count;
  if (count === 0) return null;
  const y = yIn instanceof Float64Array && yIn.length === n ? yIn : Float64Array.from({ length: n }, (_, k) => yIn[k]!);
  const total = (n * (n - 1)) / 2;
  const mid = count >> 1;
  // Sen (1968): C = z·√(n(n−1)(2n+5)/18) ranks either side of the median, scaled to the sampled pair count.
  const c = 1.96 * Math.sqrt((n * (n - 1) * (2 * n + 5)) / 18) * (count / total);
  const lowRank = Math.max(0, Math.floor((count - c) / 2));
  const highRank = Math.min(count - 1, Math.ceil((count + c) / 2));
  const ranks = [...new Set([lowRank, count % 2 ? mid : mid - 1, mid, highRank])].sort((u, v) => u - v);
  const values = slopeRanks(y, p, ranks);
  const at = (rank: number) => values[ranks.indexOf(rank)]!;
  const slope = count % 2 ? at(mid) : (at(mid - 1) + at(mid)) / 2;
  const resid0 = new Float64Array(n);
  for (let i = 0; i < n; i++) resid0[i] = y[i]! - slope * x[i]!;
  const intercept = median(resid0);
  let xm = 0;
  for (let i = 0; i < n; i++) xm += x[i]!;
  xm /= n;
  let sxx = 0;
  for (let i = 0; i < n; i++) sxx += (x[i]! - xm) ** 2;
  for (let i = 0; i < n; i++) resid0[i] = y[i]! - (intercept + slope * x[i]!);
  const residualSigma = MAD_TO_SIGMA * medianAbsoluteDeviation(resid0, 0);
  return {
    slope,
    intercept,
    slopeLow: at(lowRank),
    slopeHigh: at(highRank),
    pairCount: count,
    residualSigma,
    slopeStandardError: sxx > 0 ? residualSigma / Math.sqrt(sxx) : Infinity,
  };
}

/**
 * Theil–Sen line through (x, y). Up to ~900 points every pair is used; above that a deterministic sample of
 * 400 000 pairs (fixed-seed generator) keeps the cost bounded — the common practice for large n — and the 95 %
 * interval is Sen's rank interval scaled to the sampled pairs. The median and the interval ends are the order
 * statistics a full sort of the pairwise slopes gives, found without sorting them all (see slopeRanks).
 */
export function theilSen(x: ArrayLike<number>, y: ArrayLike<number>): TheilSenFit | null {
  const n = Math.min(x.length, y.length);
  if (n < 2) return null;
  return fitOverPairs(x, y, n, pairsOf(x, n));
}

/** theilSen(x, y) for each y of x's length, the pairs drawn once; every result equals theilSen's own. */
export function theilSenMany(x: ArrayLike<number>, ys: readonly ArrayLike<number>[]): (TheilSenFit | null)[] {
  const n = x.length;
  if (n < 2 || ys.some((y) => y.length !== n)) return ys.map((y) => theilSen(x, y));
  const pairs = pairsOf(x, n);
  return ys.map((y) => fitOverPairs(x, y, n, pairs));
}
