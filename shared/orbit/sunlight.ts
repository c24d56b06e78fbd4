// Sunlight on a circular orbit with a cylindrical Earth shadow, and the part of it a sail can use for thrust.
import { Body, GeoVector, RotateVector, Rotation_EQJ_EQD } from 'astronomy-engine';
import { DEG_TO_RAD, EARTH_RADIUS_WGS84_KM, RAD_TO_DEG } from './constants';

/** Unit vector to the Sun in the equatorial frame of date at `epochMs` (astronomy-engine). */
export function sunDirection(epochMs: number): [number, number, number] {
  const date = new Date(epochMs);
  const v = RotateVector(Rotation_EQJ_EQD(date), GeoVector(Body.Sun, date, true));
  const r = Math.hypot(v.x, v.y, v.z);
  return [v.x / r, v.y / r, v.z / r];
}

/** Orbit-plane normal from inclination and RAAN (equatorial frame of date). */
export function orbitNormal(inclinationDeg: number, raanDeg: number): [number, number, number] {
  const i = inclinationDeg * DEG_TO_RAD,
    o = raanDeg * DEG_TO_RAD;
  return [Math.sin(i) * Math.sin(o), -Math.sin(i) * Math.cos(o), Math.cos(i)];
}

/** β angle: the Sun's elevation above the orbit plane [deg]. */
export function betaAngleDeg(opts: { epochMs: number; inclinationDeg: number; raanDeg: number }): number {
  const s = sunDirection(opts.epochMs);
  const n = orbitNormal(opts.inclinationDeg, opts.raanDeg);
  return Math.asin(Math.max(-1, Math.min(1, s[0] * n[0] + s[1] * n[1] + s[2] * n[2]))) * RAD_TO_DEG;
}

/**
 * Fraction of a circular orbit in sunlight, cylindrical shadow: shadow fraction = acos(√(h² + 2Rh)/(r·cosβ))/π
 * when |β| is below asin(R/r), else 0.
 */
export function sunlitFraction(opts: { altitudeKm: number; betaDeg?: number }): number {
  const R = EARTH_RADIUS_WGS84_KM,
    r = R + opts.altitudeKm;
  const beta = (opts.betaDeg ?? 0) * DEG_TO_RAD;
  if (Math.abs(beta) >= Math.asin(Math.min(1, R / r))) return 1;
  const x = Math.sqrt(opts.altitudeKm * opts.altitudeKm + 2 * R * opts.altitudeKm) / (r * Math.cos(beta));
  return 1 - Math.acos(Math.min(1, x)) / Math.PI;
}

/**
 * The sail faces the Sun only while the craft moves away from it (half of each orbit). The cylindrical shadow is
 * centred on the anti-Sun point, which splits the receding and approaching halves equally, so the usable fraction
 * is half the sunlit fraction: ¼ of the orbit when half of it is in shadow.
 */
export function usableThrustFraction(opts: { sunlitFraction: number }): number {
  return Math.max(0, Math.min(1, opts.sunlitFraction)) / 2;
}

export type SailThrustGeometry = {
  sunlitFraction: number;
  /** Sunlit and receding from the Sun. */
  usableFraction: number;
  /** Orbit average of cos²θ over the usable part (0 elsewhere), θ between the Sun line and the velocity: the sail normal kept along the velocity. */
  meanAlongTrackCos2: number;
  /** Orbit average of cosθ over the usable part (sail kept square to the Sun, along-track component). */
  meanAlongTrackCos: number;
};

/** Samples a circular orbit at `samples` points with the Sun at β above the plane. */
export function sailThrustGeometry(opts: { altitudeKm: number; betaDeg?: number; samples?: number }): SailThrustGeometry {
  const n = Math.max(8, Math.floor(opts.samples ?? 3600));
  const R = EARTH_RADIUS_WGS84_KM,
    r = R + opts.altitudeKm;
  const beta = (opts.betaDeg ?? 0) * DEG_TO_RAD;
  const sx = Math.cos(beta);
  let lit = 0,
    usable = 0,
    cos2 = 0,
    cos1 = 0;
  for (let k = 0; k < n; k++) {
    const u = ((k + 0.5) / n) * 2 * Math.PI;
    const px = Math.cos(u),
      py = Math.sin(u);
    const along = px * sx; // r̂·ŝ
    const perp = Math.sqrt(Math.max(0, 1 - along * along)) * r;
    const inShadow = along < 0 && perp < R;
    if (inShadow) continue;
    lit++;
    const recede = py * sx; // −t̂·ŝ with t̂ = (−sin u, cos u, 0)
    if (recede > 0) {
      usable++;
      cos2 += recede * recede;
      cos1 += recede;
    }
  }
  return { sunlitFraction: lit / n, usableFraction: usable / n, meanAlongTrackCos2: cos2 / n, meanAlongTrackCos: cos1 / n };
}

/** Sun geometry of an element set at its epoch: β angle, sunlit and usable-thrust fractions at a given altitude. */
export function sunlightAtEpoch(opts: { epochMs: number; inclinationDeg: number; raanDeg: number; altitudeKm: number }): {
  betaDeg: number;
  sunlitFraction: number;
  usableThrustFraction: number;
} {
  const betaDeg = betaAngleDeg(opts);
  const lit = sunlitFraction({ altitudeKm: opts.altitudeKm, betaDeg });
  return { betaDeg, sunlitFraction: lit, usableThrustFraction: usableThrustFraction({ sunlitFraction: lit }) };
}
