// Physical and model constants, each with its published source.

/** WGS-72 gravitational parameter as SGP4 uses it [km³/s²] — SGP4 reference implementation (Vallado et al., AIAA 2006-6753). */
export const MU_WGS72_KM3_PER_S2 = 398600.8;
/** WGS-72 equatorial radius as SGP4 uses it [km] — same source. */
export const EARTH_RADIUS_WGS72_KM = 6378.135;
/** WGS-72 J2 as SGP4 uses it — same source. */
export const J2_WGS72 = 0.001082616;
/** SGP4's xke = 60 / sqrt(R³/μ) [1/min in Earth-radii units] — same source. */
export const XKE_WGS72_PER_MIN = 60 / Math.sqrt(EARTH_RADIUS_WGS72_KM ** 3 / MU_WGS72_KM3_PER_S2);

/** WGS-84 gravitational parameter [m³/s²] — NIMA TR8350.2. */
export const MU_WGS84_M3_PER_S2 = 3.986004418e14;
/** WGS-84 semi-major axis [km] — NIMA TR8350.2. */
export const EARTH_RADIUS_WGS84_KM = 6378.137;
/** WGS-84 flattening — NIMA TR8350.2. */
export const FLATTENING_WGS84 = 1 / 298.257223563;

/** Astronomical unit [m], exact — IAU 2012 Resolution B2. */
export const AU_M = 149_597_870_700;
/** Speed of light [m/s], exact — SI / CODATA 2018. */
export const SPEED_OF_LIGHT_M_PER_S = 299_792_458;
/** Planck constant [J·s], exact — SI / CODATA 2018. */
export const PLANCK_J_S = 6.62607015e-34;
/** Total solar irradiance at 1 AU [W/m²] — Kopp & Lean 2011, GRL 38 L01706. */
export const SOLAR_IRRADIANCE_1AU_W_PER_M2 = 1360.8;

export const MS_PER_DAY = 86_400_000;
export const SECONDS_PER_DAY = 86_400;
export const MINUTES_PER_DAY = 1440;
export const TWO_PI = 2 * Math.PI;
export const DEG_TO_RAD = Math.PI / 180;
export const RAD_TO_DEG = 180 / Math.PI;

/** Flat plate in free molecular flow — common practice. */
export const DEFAULT_DRAG_COEFFICIENT = 2.2;
