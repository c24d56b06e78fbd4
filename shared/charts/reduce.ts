// Min/max per pixel column: a window of many points drawn in `columns` columns keeps, per column, the lowest and
// the highest value of each series — the envelope a line through every point would paint — and nothing else.
// The server reduces the trend with it, and a snapshot's frozen points reduce to the same series on screen.

export type Reduced = { epochMs: number[]; values: number[][]; reduced: boolean; pointsInView: number };

function lowerBound(xs: ArrayLike<number>, v: number): number {
  let lo = 0,
    hi = xs.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (xs[mid]! < v) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

/**
 * `epochMs` sorted ascending; `series` arrays of the same length. Points in [fromMs, toMs] are kept as they are
 * when there are at most two per column; otherwise each column gives two points: (its first epoch, each series'
 * minimum) and (its last epoch, each series' maximum).
 */
export function reduceMinMax(
  epochMs: ArrayLike<number>,
  series: readonly ArrayLike<number>[],
  fromMs: number,
  toMs: number,
  columns: number,
): Reduced {
  const a = lowerBound(epochMs, fromMs);
  let b = lowerBound(epochMs, toMs);
  while (b < epochMs.length && epochMs[b] === toMs) b++;
  const n = b - a;
  const k = series.length;
  if (n <= 2 * columns) {
    const values = series.map((s) => Array.prototype.slice.call(s, a, b) as number[]);
    return { epochMs: Array.prototype.slice.call(epochMs, a, b) as number[], values, reduced: false, pointsInView: n };
  }
  const outT: number[] = [];
  const outV: number[][] = series.map(() => []);
  const width = (toMs - fromMs) / columns || 1;
  const mins = new Float64Array(k),
    maxs = new Float64Array(k);
  let col = -1,
    firstT = 0,
    lastT = 0,
    count = 0;
  const flush = () => {
    if (count === 0) return;
    if (count === 1) {
      outT.push(firstT);
      for (let j = 0; j < k; j++) outV[j]!.push(mins[j]!);
      return;
    }
    outT.push(firstT, lastT);
    for (let j = 0; j < k; j++) outV[j]!.push(mins[j]!, maxs[j]!);
  };
  for (let i = a; i < b; i++) {
    const t = epochMs[i]!;
    const c = Math.min(columns - 1, Math.floor((t - fromMs) / width));
    if (c !== col) {
      flush();
      col = c;
      count = 0;
      firstT = t;
      for (let j = 0; j < k; j++) mins[j] = maxs[j] = series[j]![i]!;
    } else {
      for (let j = 0; j < k; j++) {
        const v = series[j]![i]!;
        if (v < mins[j]!) mins[j] = v;
        if (v > maxs[j]!) maxs[j] = v;
      }
    }
    lastT = t;
    count++;
  }
  flush();
  return { epochMs: outT, values: outV, reduced: true, pointsInView: n };
}
