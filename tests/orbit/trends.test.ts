// Trends, sailing periods and lifetime on synthetic histories written with our TLE writer and parsed back.
import { describe, expect, it } from 'vitest';
import {
  LIFETIME_CAUTION,
  compareSailingPeriods,
  computeTrend,
  crossoverAltitudeKm,
  deriveElementSet,
  estimateLifetime,
  formatTleFile,
  meanMotionForSemiMajorAxis,
  parseElementSets,
  theilSen,
  MU_WGS72_KM3_PER_S2,
  type ElementSet,
  type TleWriteInput,
} from '../../shared/orbit';

const DAY = 86_400_000;
const T0 = Date.UTC(2025, 0, 1);

/** Deterministic pseudo-random numbers in [−1, 1). */
function noise(seed: number) {
  let s = seed >>> 0;
  return () => {
    s = (s * 1664525 + 1013904223) >>> 0;
    return s / 2 ** 31 - 1;
  };
}

function history(opts: { days: number; perDay: number; aKm: (tDays: number) => number; noiseKm?: number; seed?: number }): TleWriteInput[] {
  const rnd = noise(opts.seed ?? 1);
  const out: TleWriteInput[] = [];
  for (let k = 0; k < opts.days * opts.perDay; k++) {
    const t = k / opts.perDay;
    const a = opts.aKm(t) + (opts.noiseKm ?? 0) * rnd();
    out.push({
      catalogNumber: '99001',
      classification: 'U',
      internationalDesignator: '25901A', // fictional (launch 901 of 2025)
      epochMs: T0 + t * DAY,
      meanMotionRevPerDay: meanMotionForSemiMajorAxis(a, 0.0012, 98.6),
      meanMotionDotRevPerDay2: 0,
      meanMotionDdotRevPerDay3: 0,
      bstar: 1e-4,
      inclinationDeg: 98.6,
      raanDeg: (10 + t * 0.9856) % 360,
      eccentricity: 0.0012,
      argPerigeeDeg: 90,
      meanAnomalyDeg: 0,
      elementSetNo: (k % 999) + 1,
      revAtEpoch: k,
    });
  }
  return out;
}

function parse(sets: TleWriteInput[]): ElementSet[] {
  const r = parseElementSets(formatTleFile(sets));
  expect(r.errors).toEqual([]);
  return r.records;
}

describe('Theil–Sen', () => {
  it('recovers an exact line and ignores up to ~29 % wild points (its breakdown point)', () => {
    const x = Array.from({ length: 100 }, (_, i) => i);
    const y = x.map((v, i) => 3 - 0.25 * v + (i % 4 === 0 ? 1000 : 0));
    const fit = theilSen(x, y)!;
    expect(fit.slope).toBeCloseTo(-0.25, 9);
    expect(fit.slopeLow).toBeLessThanOrEqual(fit.slope);
    expect(fit.slopeHigh).toBeGreaterThanOrEqual(fit.slope);
  });
});

describe('computeTrend', () => {
  const rateKmPerDay = -0.12;
  const sets = parse(history({ days: 120, perDay: 3, aKm: (t) => 7158 + rateKmPerDay * t, noiseKm: 0.05 }));

  it('sorts, de-duplicates (keeping the highest element-set number) and recovers the decay rate', () => {
    const dupes = sets.slice(0, 30).map((s) => ({ ...s, elementSetNo: s.elementSetNo + 1000 }));
    const shuffled = [...sets, ...dupes].sort((a, b) => ((a.revAtEpoch * 7919) % 101) - ((b.revAtEpoch * 7919) % 101));
    const trend = computeTrend(shuffled);
    expect(trend.counts.duplicatesRemoved).toBe(30);
    expect(trend.points).toHaveLength(sets.length);
    for (let i = 1; i < trend.points.length; i++) expect(trend.points[i]!.epochMs).toBeGreaterThan(trend.points[i - 1]!.epochMs);
    expect(trend.points.slice(0, 30).every((p) => p.elementSetNo > 1000)).toBe(true);
    expect(trend.rates!.semiMajorAxisKmPerDay).toBeCloseTo(rateKmPerDay, 3);
    expect(trend.rates!.apogeeKmPerDay).toBeCloseTo(rateKmPerDay, 2);
    expect(trend.rates!.perigeeKmPerDay).toBeCloseTo(rateKmPerDay, 2);
    const [lo, hi] = trend.intervals!.semiMajorAxisKmPerDay;
    expect(lo).toBeLessThan(rateKmPerDay);
    expect(hi).toBeGreaterThan(rateKmPerDay);
  });

  it('energy rate is dE/dt = μ/(2a²)·da/dt, and the along-track acceleration is (dE/dt)/v', () => {
    const trend = computeTrend(sets);
    const a = 7158 - 0.12 * 60;
    const expected = ((MU_WGS72_KM3_PER_S2 * 1e9) / (2 * (a * 1e3) ** 2)) * (rateKmPerDay * 1e3);
    expect(trend.rates!.energyJPerKgPerDay / expected).toBeCloseTo(1, 2);
    const v = Math.sqrt((MU_WGS72_KM3_PER_S2 * 1e9) / (a * 1e3));
    expect(trend.rates!.alongTrackAccelMPerS2 / (expected / 86_400 / v)).toBeCloseTo(1, 2);
  });

  it('flags injected outliers (MAD of residuals) and they do not move the rates', () => {
    const bad = sets.map((s, i) => (i % 37 === 5 ? { ...s, ...reparse(s, 25) } : s));
    const trend = computeTrend(bad);
    const flagged = trend.points.filter((p) => p.outlier).map((p) => p.epochMs);
    const injected = bad.filter((_, i) => i % 37 === 5).map((s) => s.epochMs);
    expect(flagged).toEqual(injected);
    expect(trend.counts.outliers).toBe(injected.length);
    expect(trend.rates!.semiMajorAxisKmPerDay).toBeCloseTo(rateKmPerDay, 3);
  });

  it('limits to a window and to one object', () => {
    const other = sets.slice(0, 10).map((s) => ({ ...s, catalogNumber: '99002' }));
    const trend = computeTrend([...sets, ...other], { fromMs: T0 + 30 * DAY, toMs: T0 + 60 * DAY });
    expect(trend.catalogNumber).toBe('99001');
    expect(trend.counts.otherObjects).toBe(10);
    expect(trend.points.every((p) => p.epochMs >= T0 + 30 * DAY && p.epochMs <= T0 + 60 * DAY)).toBe(true);
    expect(trend.points).toHaveLength(91);
  });

  it('returns no rates for fewer than three sets', () => {
    expect(computeTrend(sets.slice(0, 2)).rates).toBeNull();
  });
});

/** The same set raised by `km` in semi-major axis. */
function reparse(s: ElementSet, km: number): Partial<ElementSet> {
  const a = deriveElementSet(s).semiMajorAxisKm + km;
  return { meanMotionRevPerDay: meanMotionForSemiMajorAxis(a, s.eccentricity, s.inclinationDeg) };
}

describe('compareSailingPeriods', () => {
  // Drag alone −0.10 km/day; with the sail raising, +0.04 km/day: the sail adds 0.14 km/day.
  const segments = [
    { startDay: 0, endDay: 30, rate: -0.1, mode: 'edge-on' as const },
    { startDay: 30, endDay: 60, rate: 0.04, mode: 'raising' as const },
    { startDay: 60, endDay: 90, rate: -0.1, mode: 'edge-on' as const },
    { startDay: 90, endDay: 120, rate: 0.04, mode: 'raising' as const },
  ];
  const aAt = (t: number) => {
    let a = 7158;
    for (const s of segments) a += s.rate * Math.max(0, Math.min(t, s.endDay) - s.startDay);
    return a;
  };
  const sets = parse(history({ days: 120, perDay: 4, aKm: aAt, noiseKm: 0.03, seed: 7 }));
  const periods = segments.map((s) => ({ startMs: T0 + s.startDay * DAY + 1, endMs: T0 + s.endDay * DAY - 1, mode: s.mode }));

  it('reports the sail yield as the difference of the along-track accelerations, with an uncertainty', () => {
    const trend = computeTrend(sets);
    const cmp = compareSailingPeriods(trend.points, periods);
    expect(cmp.raising.periodCount).toBe(2);
    expect(cmp.off.periodCount).toBe(2);
    const aM = 7158 * 1e3,
      mu = MU_WGS72_KM3_PER_S2 * 1e9;
    // da/dt → dE/dt = μ/(2a²)·da/dt → a_t = (dE/dt)/v.
    const expectedYield = ((mu / (2 * aM * aM)) * ((0.14 * 1e3) / 86_400)) / Math.sqrt(mu / aM);
    expect(cmp.sailYieldMPerS2! / expectedYield).toBeCloseTo(1, 1);
    expect(cmp.uncertaintyMPerS2!).toBeGreaterThan(0);
    expect(cmp.uncertaintyMPerS2!).toBeLessThan(0.1 * expectedYield);
    expect(cmp.raising.alongTrackAccelMPerS2!).toBeGreaterThan(0);
    expect(cmp.off.alongTrackAccelMPerS2!).toBeLessThan(0);
  });

  it('notes periods with too few sets and returns null yield without an off period', () => {
    const cmp = compareSailingPeriods(computeTrend(sets).points, [
      periods[1]!,
      { startMs: T0 - 10 * DAY, endMs: T0 - 9 * DAY, mode: 'edge-on' },
    ]);
    expect(cmp.sailYieldMPerS2).toBeNull();
    expect(cmp.notes.join(' ')).toMatch(/fewer than 3/);
  });
});

describe('estimateLifetime', () => {
  const craft = { massKg: 4.8, dragAreaM2: 24, dragCoefficient: 2.2 };
  it('orders high < mean < low activity, attaches the method and the caution', () => {
    const est = estimateLifetime({ epochMs: T0, semiMajorAxisKm: 6378.137 + 600 }, craft)!;
    expect(est.high.days!).toBeLessThan(est.mean.days!);
    expect(est.mean.days!).toBeLessThan(est.low.days!);
    expect(est.mean.reentryMs).toBe(T0 + est.mean.days! * DAY);
    expect(est.caution).toBe(LIFETIME_CAUTION);
    expect(est.caution).toMatch(/not for reentry safety decisions/i);
    expect(est.method).toMatch(/RK4/);
  });
  it('matches the closed form for a single exponential layer: Δt = H/(ρ0·B·√(μa))·(e^{Δh/H} − 1) within 2 %', () => {
    // Between 600 and 500 km the CIRA-72 row at 500 km (ρ0 = 6.967e-13, H = 63.822 km) applies: from 599 km down to 500 km.
    const est = estimateLifetime({ epochMs: T0, semiMajorAxisKm: 6378.137 + 599 }, craft, { reentryAltitudeKm: 500 })!;
    const B = (2.2 * 24) / 4.8,
      H = 63.822e3,
      rho0 = 6.967e-13;
    const a = (6378.137 + 550) * 1e3;
    const tSeconds = (H / (rho0 * B * Math.sqrt(3.986004418e14 * a))) * (Math.exp(99e3 / H) - 1);
    expect(Math.abs(est.mean.days! / (tSeconds / 86_400) - 1)).toBeLessThan(0.02);
  });
  it('takes the latest of a list of sets, and outlives the horizon when the sail wins', () => {
    const sets = parse(history({ days: 5, perDay: 1, aKm: () => 6378.137 + 900 }));
    const est = estimateLifetime(sets, craft, { sail: { sailAreaM2: 24, reflectivity: 1 }, horizonYears: 5 })!;
    expect(est.startMs).toBe(sets[4]!.epochMs);
    const crossMean = crossoverAltitudeKm({ ...craft, sailAreaM2: 24, reflectivity: 1 }, { density: 'mean' })!;
    expect(900).toBeGreaterThan(crossMean);
    expect(est.mean).toMatchObject({ reentryMs: null, days: null, exceedsHorizon: true });
    expect(est.assumptions.join(' ')).toMatch(/sail/);
  });
});
