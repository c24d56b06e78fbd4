// Orbit-averaged energy balance of a sail craft on a circular orbit: sail gain (force·velocity, thrusting only
// on the sunlit part of the orbit where the craft recedes from the Sun, sail normal along the velocity so the
// thrust is (1+ρ)·P·A·cos²θ) against drag loss ½·ρ·v³·C_d·A. Per unit mass, W/kg = J/kg/s.
import { atmosphericDensityKgPerM3 } from './density';
import { circularSpeedMPerS, semiMajorAxisRateKmPerDay, solarRadiationPressurePa } from './physics';
import { sailThrustGeometry } from './sunlight';
import { EARTH_RADIUS_WGS84_KM } from './constants';
import type { DensityModel, SailCraft, SolarActivity } from './types';

export type BalanceOptions = {
  /** Density model or activity level (default 'mean'). */
  density?: DensityModel | SolarActivity;
  /** Sun elevation above the orbit plane (default 0: Sun in the plane, longest shadow). */
  betaDeg?: number;
  distanceAu?: number;
  /** false: sail edge-on, drag only. */
  sailing?: boolean;
};

export type EnergyBalance = {
  altitudeKm: number;
  densityKgPerM3: number;
  speedMPerS: number;
  sailGainWPerKg: number;
  dragLossWPerKg: number;
  netWPerKg: number;
  netJPerKgPerDay: number;
  semiMajorAxisRateKmPerDay: number;
};

export function orbitEnergyBalance(craft: SailCraft, altitudeKm: number, opts: BalanceOptions = {}): EnergyBalance {
  const rho = atmosphericDensityKgPerM3(altitudeKm, opts.density ?? 'mean');
  const v = circularSpeedMPerS(altitudeKm);
  let sailGainWPerKg = 0;
  if (opts.sailing !== false) {
    const g = sailThrustGeometry({ altitudeKm, betaDeg: opts.betaDeg ?? 0, samples: 720 });
    const p = solarRadiationPressurePa(opts.distanceAu ?? 1);
    sailGainWPerKg = ((1 + craft.reflectivity) * p * craft.sailAreaM2 * g.meanAlongTrackCos2 * v) / craft.massKg;
  }
  const dragLossWPerKg = (0.5 * rho * v * v * v * craft.dragCoefficient * craft.dragAreaM2) / craft.massKg;
  const netWPerKg = sailGainWPerKg - dragLossWPerKg;
  const netJPerKgPerDay = netWPerKg * 86_400;
  return {
    altitudeKm,
    densityKgPerM3: rho,
    speedMPerS: v,
    sailGainWPerKg,
    dragLossWPerKg,
    netWPerKg,
    netJPerKgPerDay,
    semiMajorAxisRateKmPerDay: semiMajorAxisRateKmPerDay(netJPerKgPerDay, EARTH_RADIUS_WGS84_KM + altitudeKm),
  };
}

export type CrossoverOptions = {
  density?: DensityModel | SolarActivity;
  /** 'orbit-averaged' (default) or 'instantaneous': sail square to both the Sun and the flow, F = (1+ρ)·P·A vs drag. */
  mode?: 'orbit-averaged' | 'instantaneous';
  betaDeg?: number;
  distanceAu?: number;
  searchKm?: [number, number];
};

/** Altitude where sail gain equals drag loss, by bisection; null when it is not inside `searchKm`. */
export function crossoverAltitudeKm(craft: SailCraft, opts: CrossoverOptions = {}): number | null {
  const [lo0, hi0] = opts.searchKm ?? [150, 3000];
  const net = (h: number): number => {
    if (opts.mode === 'instantaneous') {
      const rho = atmosphericDensityKgPerM3(h, opts.density ?? 'mean');
      const v = circularSpeedMPerS(h);
      const sail = (1 + craft.reflectivity) * solarRadiationPressurePa(opts.distanceAu ?? 1) * craft.sailAreaM2;
      return sail - 0.5 * rho * v * v * craft.dragCoefficient * craft.dragAreaM2;
    }
    return orbitEnergyBalance(craft, h, opts).netWPerKg;
  };
  let lo = lo0,
    hi = hi0;
  let fLo = net(lo),
    fHi = net(hi);
  if (!(fLo < 0 && fHi > 0)) return null;
  for (let k = 0; k < 60 && hi - lo > 1e-3; k++) {
    const mid = (lo + hi) / 2;
    const f = net(mid);
    if (f < 0) {
      lo = mid;
      fLo = f;
    } else {
      hi = mid;
      fHi = f;
    }
  }
  return (lo + hi) / 2;
}
