// Orbit lifetime: integrate circular-orbit drag decay da/dt = −ρ(h)·(C_d·A/m)·√(μ·a) forward from the latest
// element set, once per activity level, with RK4 and a step that limits each change of a to about 1 km.
import { EARTH_RADIUS_WGS84_KM, MS_PER_DAY } from './constants';
import { atmosphericDensityKgPerM3, DENSITY_MODEL_FOR_ACTIVITY } from './density';
import { deriveElementSet } from './derived';
import { msToIso } from './epoch';
import { dragDecayRateKmPerDay } from './physics';
import { orbitEnergyBalance } from './sail-drag-balance';
import type { Craft, ElementSet, SailCraft, SolarActivity } from './types';

export const LIFETIME_CAUTION =
  'Estimate from a simple circular-orbit decay model with tabulated densities. Not for reentry safety decisions: ' +
  'defer to official space-surveillance providers for reentry predictions.';

export type LifetimeCase = {
  activity: SolarActivity;
  /** null when the orbit outlives the horizon. */
  reentryMs: number | null;
  reentryIso: string | null;
  days: number | null;
  exceedsHorizon: boolean;
};

export type LifetimeEstimate = {
  startMs: number;
  startAltitudeKm: number;
  low: LifetimeCase;
  mean: LifetimeCase;
  high: LifetimeCase;
  method: string;
  caution: string;
  assumptions: string[];
};

export type LifetimeOptions = {
  /** Altitude taken as reentry (default 120 km). */
  reentryAltitudeKm?: number;
  horizonYears?: number;
  /** Include an orbit-raising sail (orbit-averaged, sail normal along the velocity on the sunlit receding half). */
  sail?: Pick<SailCraft, 'sailAreaM2' | 'reflectivity'> & { betaDeg?: number };
};

export type LifetimeStart = readonly ElementSet[] | { epochMs: number; semiMajorAxisKm: number; eccentricity?: number };

function startState(input: LifetimeStart): { epochMs: number; semiMajorAxisKm: number; eccentricity: number } | null {
  if (Array.isArray(input)) {
    const sets = input as readonly ElementSet[];
    if (!sets.length) return null;
    const latest = sets.reduce((a, b) => (b.epochMs > a.epochMs ? b : a));
    return { epochMs: latest.epochMs, semiMajorAxisKm: deriveElementSet(latest).semiMajorAxisKm, eccentricity: latest.eccentricity };
  }
  const s = input as { epochMs: number; semiMajorAxisKm: number; eccentricity?: number };
  return { epochMs: s.epochMs, semiMajorAxisKm: s.semiMajorAxisKm, eccentricity: s.eccentricity ?? 0 };
}

function integrate(
  start: { epochMs: number; semiMajorAxisKm: number },
  craft: Craft,
  activity: SolarActivity,
  opts: LifetimeOptions,
): LifetimeCase {
  const reentryKm = opts.reentryAltitudeKm ?? 120;
  const horizonDays = (opts.horizonYears ?? 100) * 365.25;
  const model = DENSITY_MODEL_FOR_ACTIVITY[activity];
  const rate = (aKm: number): number => {
    const h = aKm - EARTH_RADIUS_WGS84_KM;
    if (opts.sail) {
      const sc: SailCraft = { ...craft, ...opts.sail };
      return orbitEnergyBalance(sc, h, { density: model, betaDeg: opts.sail.betaDeg ?? 0 }).semiMajorAxisRateKmPerDay;
    }
    return dragDecayRateKmPerDay(atmosphericDensityKgPerM3(h, model), aKm, craft);
  };
  let a = start.semiMajorAxisKm,
    t = 0;
  for (let step = 0; step < 200_000 && t < horizonDays; step++) {
    if (a - EARTH_RADIUS_WGS84_KM <= reentryKm) break;
    const k0 = rate(a);
    if (!(k0 < 0)) break; // not decaying (the sail wins): outlives any horizon
    const dt = Math.min(30, 1 / Math.abs(k0), horizonDays - t);
    const k1 = k0,
      k2 = rate(a + (dt / 2) * k1),
      k3 = rate(a + (dt / 2) * k2),
      k4 = rate(a + dt * k3);
    let next = a + (dt / 6) * (k1 + 2 * k2 + 2 * k3 + k4);
    if (!Number.isFinite(next)) next = a + dt * k0;
    if (next - EARTH_RADIUS_WGS84_KM <= reentryKm) {
      // Last step: interpolate the crossing linearly inside it.
      t += dt * ((a - EARTH_RADIUS_WGS84_KM - reentryKm) / (a - next));
      a = EARTH_RADIUS_WGS84_KM + reentryKm;
      break;
    }
    a = next;
    t += dt;
  }
  if (!(a - EARTH_RADIUS_WGS84_KM <= reentryKm)) {
    return { activity, reentryMs: null, reentryIso: null, days: null, exceedsHorizon: true };
  }
  const reentryMs = start.epochMs + t * MS_PER_DAY;
  return { activity, reentryMs, reentryIso: msToIso(reentryMs), days: t, exceedsHorizon: false };
}

/** Lifetime at low, mean and high solar activity → a date range, with the method and a caution. */
export function estimateLifetime(input: LifetimeStart, craft: Craft, opts: LifetimeOptions = {}): LifetimeEstimate | null {
  const start = startState(input);
  if (!start || !Number.isFinite(start.semiMajorAxisKm) || !(craft.massKg > 0) || !(craft.dragAreaM2 >= 0)) return null;
  const assumptions = [
    `circular orbit at the semi-major axis of the latest set (${(start.semiMajorAxisKm - EARTH_RADIUS_WGS84_KM).toFixed(1)} km)`,
    `ballistic coefficient C_d·A/m = ${((craft.dragCoefficient * craft.dragAreaM2) / craft.massKg).toFixed(4)} m²/kg, constant`,
    'densities: low = Harris–Priester minimum, mean = CIRA-72 exponential (Vallado), high = Harris–Priester maximum',
    `reentry taken at ${opts.reentryAltitudeKm ?? 120} km; horizon ${opts.horizonYears ?? 100} years`,
  ];
  if (start.eccentricity > 0.01)
    assumptions.push(`eccentricity ${start.eccentricity.toFixed(4)} ignored: lifetime is overestimated for eccentric orbits`);
  if (opts.sail) assumptions.push('sail raising included, orbit-averaged on the sunlit receding half');
  return {
    startMs: start.epochMs,
    startAltitudeKm: start.semiMajorAxisKm - EARTH_RADIUS_WGS84_KM,
    low: integrate(start, craft, 'low', opts),
    mean: integrate(start, craft, 'mean', opts),
    high: integrate(start, craft, 'high', opts),
    method:
      'RK4 integration of circular-orbit drag decay da/dt = −ρ(h)·(C_d·A/m)·√(μa) with tabulated density, step limited to ~1 km of decay',
    caution: LIFETIME_CAUTION,
    assumptions,
  };
}
