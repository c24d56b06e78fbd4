// Atmospheric density models, kg/m³ at a geometric altitude in km.
import type { DensityModel, SolarActivity } from './types';

/**
 * Exponential model ρ = ρ0·exp(−(h − h0)/H), CIRA-72 (mean activity), from Vallado, Fundamentals of
 * Astrodynamics and Applications, 4th ed. (2013). Rows 350–1000 km as listed in shared/REFERENCES.md; rows
 * below 350 km and the 1000 km row's use above 1000 km are from memory of the same table.
 */
const CIRA72_EXPONENTIAL: ReadonlyArray<readonly [h0Km: number, rho0: number, scaleHeightKm: number]> = [
  [0, 1.225, 7.249],
  [25, 3.899e-2, 6.349],
  [30, 1.774e-2, 6.682],
  [40, 3.972e-3, 7.554],
  [50, 1.057e-3, 8.382],
  [60, 3.206e-4, 7.714],
  [70, 8.77e-5, 6.549],
  [80, 1.905e-5, 5.799],
  [90, 3.396e-6, 5.382],
  [100, 5.297e-7, 5.877],
  [110, 9.661e-8, 7.263],
  [120, 2.438e-8, 9.473],
  [130, 8.484e-9, 12.636],
  [140, 3.845e-9, 16.149],
  [150, 2.07e-9, 22.523],
  [180, 5.464e-10, 29.74],
  [200, 2.789e-10, 37.105],
  [250, 7.248e-11, 45.546],
  [300, 2.418e-11, 53.628],
  // Rows below as in REFERENCES.md §5.
  [350, 9.518e-12, 53.298],
  [400, 3.725e-12, 58.515],
  [450, 1.585e-12, 60.828],
  [500, 6.967e-13, 63.822],
  [600, 1.454e-13, 71.835],
  [700, 3.614e-14, 88.667],
  [800, 1.17e-14, 124.64],
  [900, 5.245e-15, 181.05],
  [1000, 3.019e-15, 268.0],
];

/**
 * Harris–Priester densities at the antapex (min) and apex (max) of the diurnal bulge, Montenbruck & Gill,
 * Satellite Orbits (2000). Rows 400–1000 km as listed in shared/REFERENCES.md; rows 100–380 km from memory of
 * the same table. Interpolated exponentially between rows.
 */
const HARRIS_PRIESTER: ReadonlyArray<readonly [hKm: number, rhoMin: number, rhoMax: number]> = [
  [100, 4.974e-7, 4.974e-7],
  [120, 2.49e-8, 2.49e-8],
  [130, 8.377e-9, 8.71e-9],
  [140, 3.899e-9, 4.059e-9],
  [150, 2.122e-9, 2.215e-9],
  [160, 1.263e-9, 1.344e-9],
  [170, 8.008e-10, 8.758e-10],
  [180, 5.283e-10, 6.01e-10],
  [190, 3.617e-10, 4.297e-10],
  [200, 2.557e-10, 3.162e-10],
  [210, 1.839e-10, 2.396e-10],
  [220, 1.341e-10, 1.853e-10],
  [230, 9.949e-11, 1.455e-10],
  [240, 7.488e-11, 1.157e-10],
  [250, 5.709e-11, 9.308e-11],
  [260, 4.403e-11, 7.555e-11],
  [270, 3.43e-11, 6.182e-11],
  [280, 2.697e-11, 5.095e-11],
  [290, 2.139e-11, 4.226e-11],
  [300, 1.708e-11, 3.526e-11],
  [320, 1.099e-11, 2.511e-11],
  [340, 7.214e-12, 1.819e-11],
  [360, 4.824e-12, 1.337e-11],
  [380, 3.274e-12, 9.955e-12],
  [400, 2.249e-12, 7.492e-12],
  [420, 1.558e-12, 5.684e-12],
  [440, 1.091e-12, 4.355e-12],
  [460, 7.701e-13, 3.362e-12],
  [480, 5.474e-13, 2.612e-12],
  [500, 3.916e-13, 2.042e-12],
  [520, 2.819e-13, 1.605e-12],
  [540, 2.042e-13, 1.267e-12],
  [560, 1.488e-13, 1.005e-12],
  [580, 1.092e-13, 7.997e-13],
  [600, 8.07e-14, 6.39e-13],
  [620, 6.012e-14, 5.123e-13],
  [640, 4.519e-14, 4.121e-13],
  [660, 3.43e-14, 3.325e-13],
  [680, 2.632e-14, 2.691e-13],
  [700, 2.043e-14, 2.185e-13],
  [720, 1.607e-14, 1.779e-13],
  [740, 1.281e-14, 1.452e-13],
  [760, 1.036e-14, 1.19e-13],
  [780, 8.496e-15, 9.776e-14],
  [800, 7.069e-15, 8.059e-14],
  [840, 4.68e-15, 5.741e-14],
  [880, 3.2e-15, 4.21e-14],
  [920, 2.21e-15, 3.13e-14],
  [960, 1.56e-15, 2.36e-14],
  [1000, 1.15e-15, 1.81e-14],
];

export function cira72ExponentialDensityKgPerM3(altitudeKm: number): number {
  if (!Number.isFinite(altitudeKm)) return NaN;
  const h = Math.max(0, altitudeKm);
  let row = CIRA72_EXPONENTIAL[0]!;
  for (const r of CIRA72_EXPONENTIAL) {
    if (r[0] <= h) row = r;
    else break;
  }
  return row[1] * Math.exp(-(h - row[0]) / row[2]);
}

/** column 1 = antapex (min), 2 = apex (max). Above 1000 km the last rows' scale height is extended. */
function harrisPriester(altitudeKm: number, column: 1 | 2): number {
  if (!Number.isFinite(altitudeKm)) return NaN;
  const t = HARRIS_PRIESTER;
  let i = 0;
  if (altitudeKm <= t[0]![0]) i = 0;
  else if (altitudeKm >= t[t.length - 1]![0]) i = t.length - 2;
  else while (t[i + 1]![0] <= altitudeKm) i++;
  const lo = t[i]!,
    hi = t[i + 1]!;
  const scaleHeightKm = (hi[0] - lo[0]) / Math.log(lo[column] / hi[column]);
  return lo[column] * Math.exp(-(altitudeKm - lo[0]) / scaleHeightKm);
}

export function harrisPriesterDensityKgPerM3(altitudeKm: number, bulge: 'min' | 'max'): number {
  return harrisPriester(altitudeKm, bulge === 'min' ? 1 : 2);
}

/**
 * Our activity levels: low = Harris–Priester minimum (antapex), mean = CIRA-72 exponential table, high =
 * Harris–Priester maximum (apex). The Harris–Priester columns are the diurnal extremes of one mean-activity
 * model; using them as the low/high bounds is our assumption for a spread, not a solar-cycle model.
 */
export const DENSITY_MODEL_FOR_ACTIVITY: Record<SolarActivity, DensityModel> = {
  low: 'harris-priester-min',
  mean: 'cira72-exponential',
  high: 'harris-priester-max',
};

export function atmosphericDensityKgPerM3(altitudeKm: number, model: DensityModel | SolarActivity = 'mean'): number {
  const m: DensityModel = model === 'low' || model === 'mean' || model === 'high' ? DENSITY_MODEL_FOR_ACTIVITY[model] : model;
  switch (m) {
    case 'cira72-exponential':
      return cira72ExponentialDensityKgPerM3(altitudeKm);
    case 'harris-priester-min':
      return harrisPriester(altitudeKm, 1);
    case 'harris-priester-max':
      return harrisPriester(altitudeKm, 2);
  }
}
