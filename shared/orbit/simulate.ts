// A demo history simulator: a sail craft's apogee and perigee integrated with the orbit engine's own energy
// balance (sail gain on the usable arc, drag from the tabulated density), sampled into published-style two-line
// sets with fitting noise, a few bad fits (outliers) and re-published copies (duplicates). Pure and seeded.
import { EARTH_RADIUS_WGS72_KM, MS_PER_DAY } from './constants';
import { meanMotionForSemiMajorAxis } from './derived';
import { semiMajorAxisRateKmPerDay } from './physics';
import { orbitEnergyBalance } from './sail-drag-balance';
import { betaAngleDeg, sailThrustGeometry } from './sunlight';
import type { TleWriteInput } from './tle-write';
import type { SailCraft, SailMode } from './types';

export type SimCraft = { massKg: number; sailAreaM2: number; reflectivity: number; dragCoefficient: number; dragAreaEdgeOnM2: number };

export type SimPhase = { startDay: number; endDay: number; mode: SailMode | 'stowed' };

export type SimulationOptions = {
  startMs: number;
  days: number;
  setsPerDay?: number;
  seed?: number;
  craft: SimCraft;
  startAltitudeKm: number;
  inclinationDeg: number;
  raanDeg?: number;
  phases: SimPhase[];
  catalogNumber: string;
  catalogNumberInt: number;
  internationalDesignator: string;
  name?: string;
  /** Fraction of the ideal sail gain actually achieved (pointing losses, wrinkles). */
  sailEfficiency?: number;
  /** 1σ of the fitted semi-major axis [km]. */
  semiMajorAxisNoiseKm?: number;
  /** Days (from the start) carrying a bad fit, and days whose first set is published twice. */
  outlierDays?: number[];
  duplicateDays?: number[];
};

export type SimulatedHistory = {
  sets: (TleWriteInput & { day: number; outlier: boolean; duplicate: boolean })[];
  periods: { startMs: number; endMs: number; mode: SailMode }[];
  truth: { day: number; apogeeKm: number; perigeeKm: number; mode: SimPhase['mode'] }[];
};

/** Mulberry32: small, fast, deterministic. */
function rng(seed: number) {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

function gaussian(rand: () => number) {
  const u = Math.max(1e-12, rand()),
    v = rand();
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * v);
}

// B* = B·ρ0/2 with B = C_d·A/m and ρ0 = 0.15696615 kg/m²/ER (the Spacetrack Report 3 convention; value from memory).
const BSTAR_RHO0_ER = 0.15696615;
/** Mean sun-synchronous nodal rate: 360° per tropical year [deg/day]. */
const SSO_RAAN_RATE_DEG_PER_DAY = 360 / 365.2422;

function phaseAt(phases: SimPhase[], day: number): SimPhase['mode'] {
  for (const p of phases) if (day >= p.startDay && day < p.endDay) return p.mode;
  return 'stowed';
}

/** Rates of apogee and perigee altitude [km/day] in one sail mode at one altitude. */
function rates(
  craft: SimCraft,
  mode: SimPhase['mode'],
  perigeeKm: number,
  apogeeKm: number,
  betaDeg: number,
  activity: number,
  efficiency: number,
) {
  const h = (perigeeKm + apogeeKm) / 2;
  const a = EARTH_RADIUS_WGS72_KM + h;
  const geom = sailThrustGeometry({ altitudeKm: h, betaDeg, samples: 180 });
  let dragArea = craft.dragAreaEdgeOnM2;
  let sailFactor = 0;
  if (mode === 'raising') {
    dragArea = geom.usableFraction * craft.sailAreaM2 + (1 - geom.usableFraction) * craft.dragAreaEdgeOnM2;
    sailFactor = efficiency;
  } else if (mode === 'tumbling') {
    dragArea = craft.sailAreaM2 / 2;
    sailFactor = 0.05 * efficiency;
  } else if (mode === 'unknown') {
    dragArea = craft.sailAreaM2 / 4;
  } else if (mode === 'stowed') {
    dragArea = craft.dragAreaEdgeOnM2 / 2;
  }
  const sc: SailCraft = {
    massKg: craft.massKg,
    sailAreaM2: craft.sailAreaM2,
    reflectivity: craft.reflectivity,
    dragCoefficient: craft.dragCoefficient,
    dragAreaM2: dragArea,
  };
  const bal = orbitEnergyBalance(sc, h, { density: 'mean', betaDeg, sailing: sailFactor > 0 });
  const sailA = semiMajorAxisRateKmPerDay(bal.sailGainWPerKg * sailFactor * 86_400, a);
  const dragA = semiMajorAxisRateKmPerDay(-bal.dragLossWPerKg * activity * 86_400, a);
  // Thrust on half of each orbit pumps eccentricity: most of the gain shows at apogee.
  return { apogee: 1.9 * sailA + dragA, perigee: 0.1 * sailA + dragA, total: sailA + dragA, drag: dragA, dragArea };
}

export function simulateHistory(o: SimulationOptions): SimulatedHistory {
  const rand = rng(o.seed ?? 1);
  const perDay = o.setsPerDay ?? 3;
  const efficiency = o.sailEfficiency ?? 0.4;
  const noiseKm = o.semiMajorAxisNoiseKm ?? 0.04;
  const outlierDays = new Set(o.outlierDays ?? []);
  const duplicateDays = new Set(o.duplicateDays ?? []);
  const raan0 = o.raanDeg ?? 40;
  let apogee = o.startAltitudeKm + 1.5,
    perigee = o.startAltitudeKm - 1.5;
  let revs = 1200;
  let elset = 1;
  let argp = 90;
  const stepDays = 1 / 8;
  const sets: SimulatedHistory['sets'] = [];
  const truth: SimulatedHistory['truth'] = [];
  const steps = Math.round(o.days / stepDays);
  let nextSetDay = rand() / perDay;
  let lastRates = { apogee: 0, perigee: 0, total: 0, drag: -1e-3, dragArea: o.craft.dragAreaEdgeOnM2 };
  for (let k = 0; k < steps; k++) {
    const day = k * stepDays;
    const ms = o.startMs + day * MS_PER_DAY;
    const mode = phaseAt(o.phases, day);
    const raan = raan0 + SSO_RAAN_RATE_DEG_PER_DAY * day;
    const beta = k % 8 === 0 || k === 0 ? betaAngleDeg({ epochMs: ms, inclinationDeg: o.inclinationDeg, raanDeg: raan }) : NaN;
    // Solar activity: a 27-day rotation on top of a slow rise, as a multiplier on the mean density.
    const activity = (1 + 0.25 * Math.sin((2 * Math.PI * day) / 27)) * (0.9 + 0.3 * (day / Math.max(1, o.days)));
    if (!Number.isNaN(beta) || k === 0)
      lastRates = rates(o.craft, mode, perigee, apogee, Number.isNaN(beta) ? 0 : beta, activity, efficiency);
    if (k % 8 === 0) truth.push({ day, apogeeKm: apogee, perigeeKm: perigee, mode });
    // Sets published in the step that just began.
    while (nextSetDay < day + stepDays && nextSetDay < o.days) {
      const setDay = nextSetDay;
      const setMs = o.startMs + setDay * MS_PER_DAY;
      const frac = (setDay - day) / stepDays;
      const ha = apogee + lastRates.apogee * frac * stepDays,
        hp = perigee + lastRates.perigee * frac * stepDays;
      const dayIndex = Math.floor(setDay);
      const isOutlier = outlierDays.has(dayIndex) && !sets.some((s) => s.day === dayIndex && s.outlier);
      const aTrue = EARTH_RADIUS_WGS72_KM + (ha + hp) / 2;
      const a = aTrue + noiseKm * gaussian(rand) + (isOutlier ? (rand() < 0.5 ? -1 : 1) * (9 + 14 * rand()) : 0);
      const e = Math.max(1e-6, (ha - hp) / (2 * aTrue) + 3e-6 * gaussian(rand));
      const incl = o.inclinationDeg + 0.0015 * gaussian(rand);
      const n = meanMotionForSemiMajorAxis(a, e, incl);
      const dnDt = (-1.5 * n * lastRates.total) / aTrue; // rev/day²
      const dragOnlyBstar = ((o.craft.dragCoefficient * lastRates.dragArea) / (2 * o.craft.massKg)) * BSTAR_RHO0_ER;
      // The fit's B* follows the drag area of the current attitude; the sail's push shows in the mean motion.
      const bstar = Math.max(-0.5, Math.min(0.5, dragOnlyBstar * (1 + 0.1 * gaussian(rand))));
      const set = {
        name: o.name,
        catalogNumber: o.catalogNumber,
        catalogNumberInt: o.catalogNumberInt,
        classification: 'U' as const,
        internationalDesignator: o.internationalDesignator,
        epochMs: setMs,
        meanMotionRevPerDay: n,
        meanMotionDotRevPerDay2: dnDt / 2,
        meanMotionDdotRevPerDay3: 0,
        bstar,
        inclinationDeg: incl,
        raanDeg: (raan0 + SSO_RAAN_RATE_DEG_PER_DAY * setDay) % 360,
        eccentricity: e,
        argPerigeeDeg: (((argp - 3.1 * (setDay - day)) % 360) + 360) % 360,
        meanAnomalyDeg: rand() * 360,
        elementSetNo: elset,
        revAtEpoch: Math.floor(revs + n * (setDay - day)),
        ephemerisType: 0,
        day: dayIndex,
        outlier: isOutlier,
        duplicate: false,
      };
      sets.push(set);
      if (duplicateDays.has(dayIndex) && !sets.some((s) => s.day === dayIndex && s.duplicate)) sets.push({ ...set, duplicate: true });
      elset = elset >= 999 ? 1 : elset + 1;
      nextSetDay += (1 / perDay) * (0.6 + 0.8 * rand());
    }
    apogee += lastRates.apogee * stepDays;
    perigee += lastRates.perigee * stepDays;
    if (perigee > apogee) [perigee, apogee] = [apogee, perigee];
    const aNow = EARTH_RADIUS_WGS72_KM + (apogee + perigee) / 2;
    revs += meanMotionForSemiMajorAxis(aNow, Math.max(1e-6, (apogee - perigee) / (2 * aNow)), o.inclinationDeg) * stepDays;
    argp = (((argp - 3.1 * stepDays) % 360) + 360) % 360;
  }
  const periods = o.phases
    .filter((p) => p.mode !== 'stowed' && p.startDay < o.days)
    .map((p) => ({
      startMs: o.startMs + p.startDay * MS_PER_DAY,
      endMs: o.startMs + Math.min(p.endDay, o.days) * MS_PER_DAY,
      mode: p.mode as SailMode,
    }));
  return { sets, periods, truth };
}

/**
 * Demo and test objects take catalog numbers 99000–99999 only: a fictional range, far above any number
 * catalogued so far (REFERENCES.md §2: five digits, alpha-5 beyond 99999).
 */
export const FICTIONAL_CATALOG_NUMBERS = { min: 99_000, max: 99_999 } as const;

/** The fictional Tern-1: 4.8 kg, 24 m² sail, sun-synchronous near 780 km. */
export const TERN1 = {
  name: 'TERN-1',
  catalogNumber: '99871',
  catalogNumberInt: 99871,
  // Fictional: launch 951 of 2025 (columns 10–17, YYNNNP); no year has had anywhere near 951 launches,
  // so no real object can carry it.
  internationalDesignator: '25951C',
  craft: { massKg: 4.8, sailAreaM2: 24, reflectivity: 0.9, dragCoefficient: 2.2, dragAreaEdgeOnM2: 0.12 },
  startAltitudeKm: 780,
  // Sun-synchronous at ~780 km: cos i = −(ρ̇ · a^3.5) / (1.5 · J2 · R² · √μ) gives about 98.5° (common practice, from memory).
  inclinationDeg: 98.52,
  startMs: Date.UTC(2025, 9, 20),
  days: 400,
  deploymentDay: 12,
  phases: [
    { startDay: 0, endDay: 12, mode: 'stowed' },
    { startDay: 12, endDay: 21, mode: 'tumbling' },
    { startDay: 21, endDay: 58, mode: 'edge-on' },
    { startDay: 58, endDay: 92, mode: 'raising' },
    { startDay: 92, endDay: 118, mode: 'edge-on' },
    { startDay: 118, endDay: 156, mode: 'raising' },
    { startDay: 156, endDay: 171, mode: 'unknown' },
    { startDay: 171, endDay: 210, mode: 'edge-on' },
    { startDay: 210, endDay: 252, mode: 'raising' },
    { startDay: 252, endDay: 268, mode: 'tumbling' },
    { startDay: 268, endDay: 300, mode: 'edge-on' },
    { startDay: 300, endDay: 340, mode: 'raising' },
    { startDay: 340, endDay: 366, mode: 'edge-on' },
    { startDay: 366, endDay: 420, mode: 'raising' },
  ] as SimPhase[],
  outlierDays: [33, 77, 141, 199, 236, 312, 371],
  duplicateDays: [5, 64, 130, 188, 245, 290, 333, 388],
};

export function simulateTern1(opts: { days?: number; seed?: number } = {}): SimulatedHistory {
  return simulateHistory({
    startMs: TERN1.startMs,
    days: opts.days ?? TERN1.days,
    seed: opts.seed ?? 20251020,
    craft: TERN1.craft,
    startAltitudeKm: TERN1.startAltitudeKm,
    inclinationDeg: TERN1.inclinationDeg,
    phases: TERN1.phases,
    catalogNumber: TERN1.catalogNumber,
    catalogNumberInt: TERN1.catalogNumberInt,
    internationalDesignator: TERN1.internationalDesignator,
    name: TERN1.name,
    outlierDays: TERN1.outlierDays,
    duplicateDays: TERN1.duplicateDays,
  });
}
