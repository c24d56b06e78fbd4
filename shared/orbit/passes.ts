// Visible passes over an observer (sky watch) and the craft's position now (where it is now), from one element set
// propagated with SGP4 (satellite.js). Pure: takes values, returns values; runs in the browser and on the server.
import {
  degreesLat,
  degreesLong,
  ecfToLookAngles,
  eciToEcf,
  eciToGeodetic,
  gstime,
  sgp4,
  shadowFraction,
  sunPos,
  type SatRec,
} from 'satellite.js';
import { DEG_TO_RAD, RAD_TO_DEG } from './constants';

export type Observer = { latitudeDeg: number; longitudeDeg: number; heightKm?: number };

/** What counts as a visible pass (common practice for naked-eye satellite watching). */
export type VisibilityRule = {
  /** The craft must be at least this high above the observer's horizon [deg]. */
  minElevationDeg: number;
  /** The observer's Sun must be below this altitude (civil twilight ends at −6°) [deg]. */
  maxSunAltitudeDeg: number;
};

export const DEFAULT_VISIBILITY: VisibilityRule = { minElevationDeg: 10, maxSunAltitudeDeg: -6 };

export type SkyPoint = { atMs: number; elevationDeg: number; azimuthDeg: number; compass: string };

export type VisiblePass = {
  start: SkyPoint;
  highest: SkyPoint;
  end: SkyPoint;
  durationS: number;
};

const COMPASS = ['N', 'NNE', 'NE', 'ENE', 'E', 'ESE', 'SE', 'SSE', 'S', 'SSW', 'SW', 'WSW', 'W', 'WNW', 'NW', 'NNW'];

/** 16-point compass name of an azimuth measured clockwise from north [deg]. */
export function compassPoint(azimuthDeg: number): string {
  const a = ((azimuthDeg % 360) + 360) % 360;
  return COMPASS[Math.round(a / 22.5) % 16]!;
}

const AU_KM = 149_597_870.7;

function observerGeodetic(o: Observer) {
  return { latitude: o.latitudeDeg * DEG_TO_RAD, longitude: o.longitudeDeg * DEG_TO_RAD, height: o.heightKm ?? 0 };
}

type Geo = ReturnType<typeof observerGeodetic>;

/** Julian date of a Unix time (the Unix epoch is JD 2440587.5). Cheaper than building a Date for each sample. */
const julianDate = (atMs: number) => atMs / 86_400_000 + 2440587.5;

/** Position in TEME [km] at a time, or null where SGP4 cannot propagate (decayed, bad set). */
function positionEci(satrec: SatRec, atMs: number) {
  const pv = sgp4(satrec, (julianDate(atMs) - satrec.jdsatepoch) * 1440);
  if (!pv || typeof pv.position !== 'object') return null;
  const p = pv.position;
  return Number.isFinite(p.x + p.y + p.z) ? p : null;
}

/** The craft's look angles from the observer; elevation −90° where SGP4 fails (never "visible"). */
function look(satrec: SatRec, geo: Geo, atMs: number): { elevationDeg: number; azimuthDeg: number } {
  const p = positionEci(satrec, atMs);
  if (!p) return { elevationDeg: -90, azimuthDeg: 0 };
  const la = ecfToLookAngles(geo, eciToEcf(p, gstime(julianDate(atMs))));
  return { elevationDeg: la.elevation * RAD_TO_DEG, azimuthDeg: la.azimuth * RAD_TO_DEG };
}

/** The Sun's altitude above the observer's horizon [deg] (satellite.js low-precision solar position, ~0.01°). */
export function sunAltitudeDeg(observer: Observer, atMs: number): number {
  const jd = julianDate(atMs);
  const s = sunPos(jd).rsun;
  const ecf = eciToEcf({ x: s.x * AU_KM, y: s.y * AU_KM, z: s.z * AU_KM }, gstime(jd));
  return ecfToLookAngles(observerGeodetic(observer), ecf).elevation * RAD_TO_DEG;
}

/** True while less than half of the Sun's disc is hidden by the Earth, seen from the craft. */
export function isSunlit(satrec: SatRec, atMs: number): boolean {
  const p = positionEci(satrec, atMs);
  if (!p) return false;
  return shadowFraction(sunPos(julianDate(atMs)).rsun, p) < 0.5;
}

function point(satrec: SatRec, geo: Geo, atMs: number): SkyPoint {
  const l = look(satrec, geo, atMs);
  return { atMs, elevationDeg: l.elevationDeg, azimuthDeg: l.azimuthDeg, compass: compassPoint(l.azimuthDeg) };
}

/** Last time in [lo, hi] where `pred` still holds at lo and fails at hi, to `tolMs`. */
function bisect(pred: (t: number) => boolean, lo: number, hi: number, tolMs: number): number {
  let a = lo,
    b = hi;
  const atA = pred(a);
  while (b - a > tolMs) {
    const m = (a + b) / 2;
    if (pred(m) === atA) a = m;
    else b = m;
  }
  return (a + b) / 2;
}

/** Time of the elevation maximum in [lo, hi] (golden-section search; the curve is unimodal there). */
function peak(f: (t: number) => number, lo: number, hi: number, tolMs: number): number {
  const g = (Math.sqrt(5) - 1) / 2;
  let a = lo,
    b = hi;
  let c = b - g * (b - a),
    d = a + g * (b - a);
  let fc = f(c),
    fd = f(d);
  while (b - a > tolMs) {
    if (fc > fd) {
      b = d;
      d = c;
      fd = fc;
      c = b - g * (b - a);
      fc = f(c);
    } else {
      a = c;
      c = d;
      fc = fd;
      d = a + g * (b - a);
      fd = f(d);
    }
  }
  return (a + b) / 2;
}

/** Spans where the craft is above `minElevationDeg`, each with its highest point. */
function spansAbove(satrec: SatRec, geo: Geo, fromMs: number, toMs: number, minElevationDeg: number, stepMs: number) {
  const el = (t: number) => look(satrec, geo, t).elevationDeg;
  const above = (t: number) => el(t) > minElevationDeg;
  const spans: { riseMs: number; peakMs: number; setMs: number }[] = [];
  const n = Math.ceil((toMs - fromMs) / stepMs);
  const ts: number[] = [];
  const es: number[] = [];
  for (let i = 0; i <= n; i++) {
    const t = Math.min(toMs, fromMs + i * stepMs);
    ts.push(t);
    es.push(el(t));
  }
  let lastSetMs = -Infinity;
  for (let i = 0; i < ts.length; i++) {
    // Each local maximum of the sampled elevation brackets one true maximum (a pass is one hump at this step).
    const prev = i > 0 ? es[i - 1]! : -Infinity;
    const next = i < ts.length - 1 ? es[i + 1]! : -Infinity;
    if (!(es[i]! >= prev && es[i]! > next)) continue;
    const lo = ts[Math.max(0, i - 1)]!,
      hi = ts[Math.min(ts.length - 1, i + 1)]!;
    const peakMs = peak(el, lo, hi, 100);
    if (el(peakMs) <= minElevationDeg || peakMs <= lastSetMs) continue;
    let j = i;
    while (j > 0 && es[j - 1]! > minElevationDeg) j--;
    const riseMs = j === 0 && es[0]! > minElevationDeg ? fromMs : bisect(above, ts[Math.max(0, j - 1)]!, Math.min(peakMs, ts[j]!), 50);
    let k = i;
    while (k < ts.length - 1 && es[k + 1]! > minElevationDeg) k++;
    const setMs =
      k === ts.length - 1 && es[k]! > minElevationDeg
        ? toMs
        : bisect(above, Math.max(peakMs, ts[k]!), ts[Math.min(ts.length - 1, k + 1)]!, 50);
    spans.push({ riseMs, peakMs, setMs });
    lastSetMs = setMs;
  }
  return spans;
}

/**
 * The visible passes between `fromMs` and `toMs`: the craft above `minElevationDeg`, sunlit, while the observer's Sun
 * is below `maxSunAltitudeDeg`. Start, highest point and end are found to 0.1 s; one pass above the horizon may hold
 * two visible stretches (e.g. the craft enters the Earth's shadow and leaves it again), each reported.
 */
export function findVisiblePasses(opts: {
  satrec: SatRec;
  observer: Observer;
  fromMs: number;
  toMs: number;
  rule?: VisibilityRule;
  /** Coarse sampling step; one minute resolves every low-orbit pass (each lasts several minutes above the horizon). */
  stepMs?: number;
}): VisiblePass[] {
  const { satrec, observer, fromMs, toMs } = opts;
  const rule = opts.rule ?? DEFAULT_VISIBILITY;
  const geo = observerGeodetic(observer);
  const el = (t: number) => look(satrec, geo, t).elevationDeg;
  const visible = (t: number) => sunAltitudeDeg(observer, t) < rule.maxSunAltitudeDeg && isSunlit(satrec, t);
  const out: VisiblePass[] = [];
  for (const span of spansAbove(satrec, geo, fromMs, toMs, rule.minElevationDeg, opts.stepMs ?? 120_000)) {
    // Sunlight and twilight change at most a few times in a pass: 20 s samples, then bisection to 0.1 s at each change.
    const step = 20_000;
    const samples: number[] = [];
    for (let t = span.riseMs; t < span.setMs; t += step) samples.push(t);
    samples.push(span.setMs);
    let startMs: number | null = null;
    let prevT = samples[0]!;
    let prevV = visible(prevT);
    if (prevV) startMs = prevT;
    const close = (endMs: number) => {
      const s = startMs!;
      const highestMs = span.peakMs >= s && span.peakMs <= endMs ? span.peakMs : el(s) >= el(endMs) ? s : endMs;
      out.push({
        start: point(satrec, geo, s),
        highest: point(satrec, geo, highestMs),
        end: point(satrec, geo, endMs),
        durationS: (endMs - s) / 1000,
      });
      startMs = null;
    };
    for (let i = 1; i < samples.length; i++) {
      const t = samples[i]!;
      const v = visible(t);
      if (v !== prevV) {
        const edge = bisect(visible, prevT, t, 50);
        if (v) startMs = edge;
        else close(edge);
      }
      prevT = t;
      prevV = v;
    }
    if (startMs !== null) close(span.setMs);
  }
  return out;
}

export type GroundPoint = { atMs: number; latitudeDeg: number; longitudeDeg: number; altitudeKm: number };

/** The sub-satellite point (geodetic latitude/longitude, height above the ellipsoid) at a time, or null. */
export function subSatellitePoint(satrec: SatRec, atMs: number): GroundPoint | null {
  const p = positionEci(satrec, atMs);
  if (!p) return null;
  const g = eciToGeodetic(p, gstime(julianDate(atMs)));
  return { atMs, latitudeDeg: degreesLat(g.latitude), longitudeDeg: degreesLong(g.longitude), altitudeKm: g.height };
}

/** Ground track from `fromMs` for `durationMs`, one point per `stepMs`; points where SGP4 fails are left out. */
export function groundTrack(satrec: SatRec, fromMs: number, durationMs: number, stepMs = 30_000): GroundPoint[] {
  const out: GroundPoint[] = [];
  for (let t = fromMs; t <= fromMs + durationMs; t += stepMs) {
    const g = subSatellitePoint(satrec, t);
    if (g) out.push(g);
  }
  return out;
}

/** The point on Earth where the Sun stands overhead [deg] (the day/night line is the great circle 90° from it). */
export function subSolarPoint(atMs: number): { latitudeDeg: number; longitudeDeg: number } {
  const jd = julianDate(atMs);
  const s = sunPos(jd).rsun;
  const ecf = eciToEcf(s, gstime(jd));
  const r = Math.hypot(ecf.x, ecf.y, ecf.z);
  return { latitudeDeg: Math.asin(ecf.z / r) * RAD_TO_DEG, longitudeDeg: Math.atan2(ecf.y, ecf.x) * RAD_TO_DEG };
}
