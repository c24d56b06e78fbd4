// SGP4 (satellite.js) propagation with named errors, and the true min/max geodetic altitude over one revolution.
import { sgp4, twoline2satrec, type SatRec } from 'satellite.js';
import { EARTH_RADIUS_WGS84_KM, FLATTENING_WGS84, TWO_PI } from './constants';
import type { ElementSet } from './types';

/** SGP4's error codes (Vallado et al. 2006), by name. */
export const SGP4_ERROR_NAMES: Record<number, string> = {
  1: 'mean-eccentricity-out-of-range',
  2: 'mean-motion-below-zero',
  3: 'perturbed-eccentricity-out-of-range',
  4: 'semi-latus-rectum-below-zero',
  5: 'epoch-elements-sub-orbital',
  6: 'decayed',
};

export type Sgp4Failure = { code: number; name: string; atMinutes: number; message: string };

export function sgp4Failure(code: number, atMinutes: number): Sgp4Failure {
  const name = SGP4_ERROR_NAMES[code] ?? 'non-finite-state';
  return { code, name, atMinutes, message: `SGP4 failed at ${atMinutes} min from epoch: ${name}` };
}

export type TemeState = { positionKm: [number, number, number]; velocityKmPerS: [number, number, number] };

export function createSatrec(set: Pick<ElementSet, 'line1' | 'line2'>): SatRec {
  return twoline2satrec(set.line1, set.line2);
}

/** TEME position and velocity at `minutes` since epoch, or a named SGP4 failure. Never throws. */
export function propagateMinutes(satrec: SatRec, minutes: number): TemeState | Sgp4Failure {
  let pv: ReturnType<typeof sgp4>;
  try {
    pv = sgp4(satrec, minutes);
  } catch {
    return sgp4Failure(0, minutes);
  }
  if (!pv || satrec.error) return sgp4Failure(satrec.error || 0, minutes);
  const r = pv.position,
    v = pv.velocity;
  if (!Number.isFinite(r.x + r.y + r.z + v.x + v.y + v.z)) return sgp4Failure(0, minutes);
  return { positionKm: [r.x, r.y, r.z], velocityKmPerS: [v.x, v.y, v.z] };
}

const E2 = FLATTENING_WGS84 * (2 - FLATTENING_WGS84);

/**
 * Height above the WGS-84 ellipsoid [km] from an Earth-centred position; longitude does not enter, so no
 * sidereal time is needed. Iterates the latitude to 1e-12 rad (same fixed point as satellite.js eciToGeodetic).
 */
export function geodeticHeightKm(x: number, y: number, z: number): number {
  const a = EARTH_RADIUS_WGS84_KM;
  const p = Math.sqrt(x * x + y * y);
  let lat = Math.atan2(z, p * (1 - E2));
  let c = 1;
  for (let k = 0; k < 10; k++) {
    const s = Math.sin(lat);
    c = 1 / Math.sqrt(1 - E2 * s * s);
    const next = Math.atan2(z + a * c * E2 * s, p);
    const done = Math.abs(next - lat) < 1e-12;
    lat = next;
    if (done) break;
  }
  const s = Math.sin(lat);
  c = 1 / Math.sqrt(1 - E2 * s * s);
  const cl = Math.cos(lat);
  // Near the poles p/cos(lat) loses precision; use the z form there.
  return Math.abs(cl) > 1e-3 ? p / cl - a * c : z / s - a * c * (1 - E2);
}

export type AltitudeRange =
  | {
      ok: true;
      minAltitudeKm: number;
      maxAltitudeKm: number;
      minAtMinutes: number;
      maxAtMinutes: number;
      periodMin: number;
      sampleCount: number;
    }
  | { ok: false; error: Sgp4Failure };

/**
 * Min and max geodetic (WGS-84) altitude over one revolution from the epoch, sampling SGP4 `samplesPerRev`
 * times. Pass `satrec` to reuse one already made from the set's lines.
 */
export function sgp4AltitudeRange(
  set: Pick<ElementSet, 'line1' | 'line2'>,
  opts: { samplesPerRev?: number; startMinutes?: number; satrec?: SatRec } = {},
): AltitudeRange {
  const samples = Math.max(2, Math.min(100_000, Math.floor(opts.samplesPerRev ?? 60)));
  const start = opts.startMinutes ?? 0;
  let satrec: SatRec;
  try {
    satrec = opts.satrec ?? twoline2satrec(set.line1, set.line2);
  } catch {
    return { ok: false, error: sgp4Failure(0, start) };
  }
  if (satrec.error) return { ok: false, error: sgp4Failure(satrec.error, start) };
  const periodMin = TWO_PI / satrec.no;
  if (!Number.isFinite(periodMin) || periodMin <= 0) return { ok: false, error: sgp4Failure(2, start) };
  const step = periodMin / samples;
  let min = Infinity,
    max = -Infinity,
    minAt = start,
    maxAt = start;
  for (let k = 0; k < samples; k++) {
    const t = start + k * step;
    const pv = sgp4(satrec, t);
    if (!pv || satrec.error) return { ok: false, error: sgp4Failure(satrec.error || 0, t) };
    const r = pv.position;
    const h = geodeticHeightKm(r.x, r.y, r.z);
    if (!Number.isFinite(h)) return { ok: false, error: sgp4Failure(0, t) };
    if (h < min) {
      min = h;
      minAt = t;
    }
    if (h > max) {
      max = h;
      maxAt = t;
    }
  }
  return { ok: true, minAltitudeKm: min, maxAltitudeKm: max, minAtMinutes: minAt, maxAtMinutes: maxAt, periodMin, sampleCount: samples };
}
