// Sail and drag relations (McInnes, Solar Sailing, 1999; drag ½ρv²C_dA), each a pure function in SI units.
import { EARTH_RADIUS_WGS84_KM, MU_WGS84_M3_PER_S2, PLANCK_J_S, SOLAR_IRRADIANCE_1AU_W_PER_M2, SPEED_OF_LIGHT_M_PER_S } from './constants';
import type { SailCraft } from './types';

/** Solar irradiance at `distanceAu` from the Sun, inverse square from 1 AU [W/m²]. */
export function solarIrradianceWPerM2(distanceAu = 1, irradianceAt1AuWPerM2 = SOLAR_IRRADIANCE_1AU_W_PER_M2): number {
  return irradianceAt1AuWPerM2 / (distanceAu * distanceAu);
}

/** Momentum of one photon p = h/λ [kg·m/s]. */
export function photonMomentumKgMPerS(wavelengthM: number): number {
  return PLANCK_J_S / wavelengthM;
}

/** Radiation pressure on a fully absorbing surface facing the Sun, P = S/c [N/m² = Pa]. */
export function solarRadiationPressurePa(distanceAu = 1, irradianceAt1AuWPerM2 = SOLAR_IRRADIANCE_1AU_W_PER_M2): number {
  return solarIrradianceWPerM2(distanceAu, irradianceAt1AuWPerM2) / SPEED_OF_LIGHT_M_PER_S;
}

/**
 * Pressure on a flat sail at normal incidence: (1 + reflectivity)·S/c — S/c absorbed (reflectivity 0), 2·S/c for
 * an ideal reflector (reflectivity 1) [Pa].
 */
export function sailPressurePa(reflectivity: number, distanceAu = 1, irradianceAt1AuWPerM2 = SOLAR_IRRADIANCE_1AU_W_PER_M2): number {
  return (1 + reflectivity) * solarRadiationPressurePa(distanceAu, irradianceAt1AuWPerM2);
}

export type SailForce = {
  /** Along the sail normal (away from the Sun) [N]. */
  normalN: number;
  /** In the sail plane, away from the Sun's projection [N] (absorbed part only). */
  tangentialN: number;
  magnitudeN: number;
};

/**
 * Force on a flat sail of `sailAreaM2` whose normal makes `incidenceRad` with the Sun line. The reflected
 * fraction ρ gives 2·ρ·P·A·cos²θ along the normal; the absorbed fraction gives P·A·cosθ along the Sun line
 * (cos²θ normal, cosθ·sinθ tangential). Ideal reflector: F = 2·P·A·cos²θ.
 */
export function sailForceN(sail: Pick<SailCraft, 'sailAreaM2' | 'reflectivity'>, incidenceRad = 0, distanceAu = 1): SailForce {
  const p = solarRadiationPressurePa(distanceAu);
  const c = Math.max(0, Math.cos(incidenceRad));
  const s = Math.sin(Math.abs(incidenceRad));
  const rho = sail.reflectivity;
  const normalN = p * sail.sailAreaM2 * c * c * (1 + rho);
  const tangentialN = p * sail.sailAreaM2 * c * s * (1 - rho);
  return { normalN, tangentialN, magnitudeN: Math.hypot(normalN, tangentialN) };
}

/** Sail loading σ = m/A [kg/m²]. */
export function sailLoadingKgPerM2(craft: Pick<SailCraft, 'massKg' | 'sailAreaM2'>): number {
  return craft.massKg / craft.sailAreaM2;
}

/**
 * Characteristic acceleration a0 = 2·η·P/σ at 1 AU, normal incidence, with efficiency η = (1 + ρ)/2 so that
 * 2·η·P = (1 + ρ)·S/c [m/s²] (McInnes 1999).
 */
export function characteristicAccelerationMPerS2(craft: Pick<SailCraft, 'massKg' | 'sailAreaM2' | 'reflectivity'>, distanceAu = 1): number {
  return sailPressurePa(craft.reflectivity, distanceAu) / sailLoadingKgPerM2(craft);
}

/** Drag F = ½·ρ·v²·C_d·A [N]. */
export function dragForceN(densityKgPerM3: number, speedMPerS: number, dragCoefficient: number, areaM2: number): number {
  return 0.5 * densityKgPerM3 * speedMPerS * speedMPerS * dragCoefficient * areaM2;
}

/** Circular orbit speed √(μ/r) at an altitude above the WGS-84 equatorial radius [m/s]. */
export function circularSpeedMPerS(altitudeKm: number): number {
  return Math.sqrt(MU_WGS84_M3_PER_S2 / ((EARTH_RADIUS_WGS84_KM + altitudeKm) * 1e3));
}

/** Circular-orbit decay by drag, da/dt = −ρ·(C_d·A/m)·√(μ·a) (energy balance) [km/day]. */
export function dragDecayRateKmPerDay(
  densityKgPerM3: number,
  semiMajorAxisKm: number,
  craft: { massKg: number; dragAreaM2: number; dragCoefficient: number },
): number {
  const a = semiMajorAxisKm * 1e3;
  return (-densityKgPerM3 * ((craft.dragCoefficient * craft.dragAreaM2) / craft.massKg) * Math.sqrt(MU_WGS84_M3_PER_S2 * a) * 86_400) / 1e3;
}

/** Along-track acceleration from a specific-energy rate on a circular orbit: a_t = (dE/dt)/v [m/s²]. */
export function alongTrackAccelerationMPerS2(
  energyRateJPerKgPerDay: number,
  semiMajorAxisKm: number,
  muM3PerS2 = MU_WGS84_M3_PER_S2,
): number {
  const v = Math.sqrt(muM3PerS2 / (semiMajorAxisKm * 1e3));
  return energyRateJPerKgPerDay / 86_400 / v;
}

/** Semi-major-axis rate from a specific-energy rate: E = −μ/(2a) ⇒ da/dt = 2a²/μ · dE/dt [km/day]. */
export function semiMajorAxisRateKmPerDay(energyRateJPerKgPerDay: number, semiMajorAxisKm: number, muM3PerS2 = MU_WGS84_M3_PER_S2): number {
  const a = semiMajorAxisKm * 1e3;
  return (((2 * a * a) / muM3PerS2) * energyRateJPerKgPerDay) / 1e3;
}
