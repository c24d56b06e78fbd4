// Orbit quantities as SGP4 treats an element set: the published (Kozai) mean motion is "un-Kozai'd" with J2
// exactly as SGP4's initialisation does, and the semi-major axis follows from it with WGS-72 constants
// (μ = 398600.8 km³/s², R = 6378.135 km). Altitudes are above a sphere of radius R (as SGP4's own perigee is).
import { DEG_TO_RAD, EARTH_RADIUS_WGS72_KM, J2_WGS72, MINUTES_PER_DAY, MU_WGS72_KM3_PER_S2, TWO_PI, XKE_WGS72_PER_MIN } from './constants';
import type { ElementSet } from './types';

export type DerivedElements = {
  /** Un-Kozai'd mean motion (SGP4's `no`) [rev/day]. */
  meanMotionSgp4RevPerDay: number;
  /** SGP4's semi-major axis from the un-Kozai'd mean motion, WGS-72 [km]. */
  semiMajorAxisKm: number;
  /** Plain Kepler a = (μ/n²)^(1/3) from the published Kozai mean motion, WGS-72 [km] — differs by up to a few km. */
  keplerSemiMajorAxisKm: number;
  apogeeAltitudeKm: number;
  perigeeAltitudeKm: number;
  /** a − R. */
  meanAltitudeKm: number;
  /** 2π / un-Kozai'd mean motion [min]. */
  periodMin: number;
  /** −μ/(2a) [J/kg]. */
  specificEnergyJPerKg: number;
  /** da/dt = −(2/3)·(a/n)·dn/dt with dn/dt = 2 × the TLE field ṅ/2 [km/day]. */
  decayRateKmPerDay: number;
};

/** The derived values kept with each stored set and each trend point. */
export type OrbitSummary = Pick<
  DerivedElements,
  'semiMajorAxisKm' | 'apogeeAltitudeKm' | 'perigeeAltitudeKm' | 'meanAltitudeKm' | 'periodMin' | 'specificEnergyJPerKg'
>;

export type DeriveInput = Pick<ElementSet, 'meanMotionRevPerDay' | 'eccentricity' | 'inclinationDeg' | 'meanMotionDotRevPerDay2'>;

/** SGP4's un-Kozai step (initl), in rad/min. */
export function unKozaiMeanMotionRadPerMin(meanMotionRevPerDay: number, eccentricity: number, inclinationDeg: number): number {
  const no = (meanMotionRevPerDay * TWO_PI) / MINUTES_PER_DAY;
  const cosio = Math.cos(inclinationDeg * DEG_TO_RAD);
  const omeosq = 1 - eccentricity * eccentricity;
  const rteosq = Math.sqrt(omeosq);
  const ak = (XKE_WGS72_PER_MIN / no) ** (2 / 3);
  const d1 = (0.75 * J2_WGS72 * (3 * cosio * cosio - 1)) / (rteosq * omeosq);
  let del = d1 / (ak * ak);
  const adel = ak * (1 - del * del - del * (1 / 3 + (134 * del * del) / 81));
  del = d1 / (adel * adel);
  return no / (1 + del);
}

export function deriveElementSet(set: DeriveInput): DerivedElements {
  const n = set.meanMotionRevPerDay;
  const e = set.eccentricity;
  const noRadPerMin = unKozaiMeanMotionRadPerMin(n, e, set.inclinationDeg);
  const aKm = (XKE_WGS72_PER_MIN / noRadPerMin) ** (2 / 3) * EARTH_RADIUS_WGS72_KM;
  const nKozaiRadPerS = (n * TWO_PI) / 86_400;
  const keplerA = Math.cbrt(MU_WGS72_KM3_PER_S2 / (nKozaiRadPerS * nKozaiRadPerS));
  const nSgp4RevPerDay = (noRadPerMin * MINUTES_PER_DAY) / TWO_PI;
  const dnDt = 2 * set.meanMotionDotRevPerDay2;
  return {
    meanMotionSgp4RevPerDay: nSgp4RevPerDay,
    semiMajorAxisKm: aKm,
    keplerSemiMajorAxisKm: keplerA,
    apogeeAltitudeKm: aKm * (1 + e) - EARTH_RADIUS_WGS72_KM,
    perigeeAltitudeKm: aKm * (1 - e) - EARTH_RADIUS_WGS72_KM,
    meanAltitudeKm: aKm - EARTH_RADIUS_WGS72_KM,
    periodMin: TWO_PI / noRadPerMin,
    specificEnergyJPerKg: -(MU_WGS72_KM3_PER_S2 * 1e9) / (2 * aKm * 1e3),
    decayRateKmPerDay: -(2 / 3) * (aKm / nSgp4RevPerDay) * dnDt,
  };
}

/**
 * Kozai mean motion [rev/day] whose SGP4 semi-major axis is `semiMajorAxisKm` (inverse of `deriveElementSet`),
 * for writing simulated element sets.
 */
export function meanMotionForSemiMajorAxis(semiMajorAxisKm: number, eccentricity: number, inclinationDeg: number): number {
  const target = ((XKE_WGS72_PER_MIN / (semiMajorAxisKm / EARTH_RADIUS_WGS72_KM) ** 1.5) * MINUTES_PER_DAY) / TWO_PI;
  let n = target;
  for (let k = 0; k < 20; k++) {
    const got = (unKozaiMeanMotionRadPerMin(n, eccentricity, inclinationDeg) * MINUTES_PER_DAY) / TWO_PI;
    const next = n * (target / got);
    if (Math.abs(next - n) < 1e-13 * n) return next;
    n = next;
  }
  return n;
}
