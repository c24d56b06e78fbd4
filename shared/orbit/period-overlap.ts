// Sailing periods are half-open spans [start, end) per craft; two of them may touch but not overlap (the
// database holds the same rule as an exclusion constraint on tstzrange(start_at, end_at, '[)')).

export type Span = { startMs: number; endMs: number };

export function overlaps(a: Span, b: Span): boolean {
  return a.startMs < b.endMs && b.startMs < a.endMs;
}

/** The periods among `others` that the span overlaps, earliest first. */
export function overlapping<T extends Span>(span: Span, others: readonly T[]): T[] {
  return others.filter((o) => overlaps(span, o)).sort((a, b) => a.startMs - b.startMs);
}

/**
 * The longest part of `span` that overlaps none of `others` (ties: the earliest), or null when nothing of it is
 * free. This is what "trim" offers: the period shortened so that it only touches its neighbours.
 */
export function trimToFree(span: Span, others: readonly Span[]): Span | null {
  let pieces: Span[] = [span];
  for (const o of others) {
    const next: Span[] = [];
    for (const p of pieces) {
      if (!overlaps(p, o)) {
        next.push(p);
        continue;
      }
      if (p.startMs < o.startMs) next.push({ startMs: p.startMs, endMs: o.startMs });
      if (o.endMs < p.endMs) next.push({ startMs: o.endMs, endMs: p.endMs });
    }
    pieces = next;
  }
  let best: Span | null = null;
  for (const p of pieces) if (p.endMs > p.startMs && (!best || p.endMs - p.startMs > best.endMs - best.startMs)) best = p;
  return best;
}
