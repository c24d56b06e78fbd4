// Sail yield from sailing periods: the energy rate while raising minus the energy rate while edge-on, each
// measured per period by a Theil–Sen slope (each period has its own energy level) and combined across periods.
import { MU_WGS72_KM3_PER_S2 } from './constants';
import { alongTrackAccelerationMPerS2 } from './physics';
import { theilSen } from './robust-stats';
import type { SailingPeriod, SailMode } from './types';

export type SailingPoint = { epochMs: number; specificEnergyJPerKg: number; semiMajorAxisKm: number; outlier?: boolean };

export type PeriodRate = SailingPeriod & {
  pointCount: number;
  energyRateJPerKgPerDay: number | null;
  /** From the residual scatter of the period's points. */
  standardErrorJPerKgPerDay: number | null;
  meanSemiMajorAxisKm: number | null;
};

export type ModeSummary = {
  modes: SailMode[];
  periodCount: number;
  pointCount: number;
  energyRateJPerKgPerDay: number | null;
  uncertaintyJPerKgPerDay: number | null;
  alongTrackAccelMPerS2: number | null;
  uncertaintyMPerS2: number | null;
};

export type SailingComparison = {
  raising: ModeSummary;
  off: ModeSummary;
  periods: PeriodRate[];
  /** Net along-track acceleration the sail adds: raising minus off [m/s²]; null without both. */
  sailYieldMPerS2: number | null;
  /** 1σ, from the scatter within and between periods, both groups combined in quadrature [m/s²]. */
  uncertaintyMPerS2: number | null;
  sailYieldJPerKgPerDay: number | null;
  notes: string[];
};

function periodRate(points: readonly SailingPoint[], period: SailingPeriod, minPoints: number): PeriodRate {
  const inside = points.filter((p) => !p.outlier && p.epochMs >= period.startMs && p.epochMs <= period.endMs);
  const out: PeriodRate = {
    ...period,
    pointCount: inside.length,
    energyRateJPerKgPerDay: null,
    standardErrorJPerKgPerDay: null,
    meanSemiMajorAxisKm: null,
  };
  if (inside.length < minPoints) return out;
  const t0 = inside[0]!.epochMs;
  const fit = theilSen(
    Float64Array.from(inside, (p) => (p.epochMs - t0) / 86_400_000),
    Float64Array.from(inside, (p) => p.specificEnergyJPerKg),
  );
  if (!fit) return out;
  out.energyRateJPerKgPerDay = fit.slope;
  out.standardErrorJPerKgPerDay = Number.isFinite(fit.slopeStandardError) ? fit.slopeStandardError : null;
  out.meanSemiMajorAxisKm = inside.reduce((s, p) => s + p.semiMajorAxisKm, 0) / inside.length;
  return out;
}

function summarise(rates: PeriodRate[], modes: SailMode[]): ModeSummary {
  const used = rates.filter((r) => modes.includes(r.mode) && r.energyRateJPerKgPerDay !== null);
  const summary: ModeSummary = {
    modes,
    periodCount: used.length,
    pointCount: used.reduce((s, r) => s + r.pointCount, 0),
    energyRateJPerKgPerDay: null,
    uncertaintyJPerKgPerDay: null,
    alongTrackAccelMPerS2: null,
    uncertaintyMPerS2: null,
  };
  if (!used.length) return summary;
  const w = used.map((r) => 1 / Math.max((r.standardErrorJPerKgPerDay ?? Infinity) ** 2, 1e-30));
  const wFinite = w.every((x) => Number.isFinite(x) && x > 0) ? w : used.map(() => 1);
  const wSum = wFinite.reduce((s, x) => s + x, 0);
  const mean = used.reduce((s, r, i) => s + wFinite[i]! * r.energyRateJPerKgPerDay!, 0) / wSum;
  let unc = wFinite === w ? Math.sqrt(1 / wSum) : NaN;
  if (used.length >= 2) {
    const k = used.length;
    const sd = Math.sqrt(used.reduce((s, r) => s + (r.energyRateJPerKgPerDay! - mean) ** 2, 0) / (k - 1));
    unc = Math.max(Number.isFinite(unc) ? unc : 0, sd / Math.sqrt(k));
  }
  const aKm = used.reduce((s, r) => s + r.meanSemiMajorAxisKm!, 0) / used.length;
  const mu = MU_WGS72_KM3_PER_S2 * 1e9;
  summary.energyRateJPerKgPerDay = mean;
  summary.uncertaintyJPerKgPerDay = Number.isFinite(unc) ? unc : null;
  summary.alongTrackAccelMPerS2 = alongTrackAccelerationMPerS2(mean, aKm, mu);
  summary.uncertaintyMPerS2 =
    summary.uncertaintyJPerKgPerDay === null ? null : alongTrackAccelerationMPerS2(summary.uncertaintyJPerKgPerDay, aKm, mu);
  return summary;
}

export function compareSailingPeriods(
  points: readonly SailingPoint[],
  periods: readonly SailingPeriod[],
  opts: { offModes?: SailMode[]; minPointsPerPeriod?: number } = {},
): SailingComparison {
  const minPoints = Math.max(3, opts.minPointsPerPeriod ?? 3);
  const offModes = opts.offModes ?? ['edge-on'];
  const sorted = [...points].sort((a, b) => a.epochMs - b.epochMs);
  const rates = periods.filter((p) => p.endMs > p.startMs).map((p) => periodRate(sorted, p, minPoints));
  const raising = summarise(rates, ['raising']);
  const off = summarise(rates, offModes);
  const notes: string[] = [];
  const thin = rates.filter((r) => r.energyRateJPerKgPerDay === null);
  if (thin.length) notes.push(`${thin.length} period(s) had fewer than ${minPoints} element sets and were not used`);
  if (raising.periodCount === 0) notes.push('no usable raising period');
  if (off.periodCount === 0) notes.push(`no usable ${offModes.join('/')} period`);
  let sailYieldMPerS2: number | null = null,
    uncertaintyMPerS2: number | null = null,
    sailYieldJPerKgPerDay: number | null = null;
  if (raising.alongTrackAccelMPerS2 !== null && off.alongTrackAccelMPerS2 !== null) {
    sailYieldMPerS2 = raising.alongTrackAccelMPerS2 - off.alongTrackAccelMPerS2;
    sailYieldJPerKgPerDay = raising.energyRateJPerKgPerDay! - off.energyRateJPerKgPerDay!;
    if (raising.uncertaintyMPerS2 !== null && off.uncertaintyMPerS2 !== null)
      uncertaintyMPerS2 = Math.hypot(raising.uncertaintyMPerS2, off.uncertaintyMPerS2);
  }
  return { raising, off, periods: rates, sailYieldMPerS2, uncertaintyMPerS2, sailYieldJPerKgPerDay, notes };
}
