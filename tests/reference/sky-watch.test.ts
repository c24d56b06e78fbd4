// Sky watch and "where it is now" checked against independent computations:
// - the Sun's altitude against astronomy-engine (a general-purpose ephemeris library from the registry);
// - the pass search against a brute-force 1-second scan over the same span with satellite.js look angles
//   (the check: rise/set within 1 s, maximum elevation within 0.1°);
// - the sub-satellite point against satellite.js eciToGeodetic at a fixed time.
// Element sets: SGP4-VER.TLE cases 06251 and 28057 (Vallado et al., "Revisiting Spacetrack Report #3", AIAA 2006-6753).
import { describe, expect, it } from 'vitest';
import { Body, Horizon, Equator, Observer as AeObserver } from 'astronomy-engine';
import { ecfToLookAngles, eciToEcf, eciToGeodetic, gstime, propagate, twoline2satrec, degreesLat, degreesLong } from 'satellite.js';
import {
  compassPoint,
  findVisiblePasses,
  isSunlit,
  subSatellitePoint,
  subSolarPoint,
  sunAltitudeDeg,
  type Observer,
} from '../../shared/orbit/passes';
import { readVerificationCases } from './reference-data';

const cases = readVerificationCases();
const set = (no: string) => {
  const c = cases.find((x) => x.catalogNumber === no)!;
  return twoline2satrec(c.line1, c.line2);
};

function aeSunAltitude(o: Observer, atMs: number): number {
  const date = new Date(atMs);
  const obs = new AeObserver(o.latitudeDeg, o.longitudeDeg, 0);
  const eq = Equator(Body.Sun, date, obs, true, true);
  return Horizon(date, obs, eq.ra, eq.dec).altitude; // no refraction: the geometric altitude
}

describe("the Sun's altitude for an observer", () => {
  it('agrees with astronomy-engine to 0.05° over a year at three latitudes', () => {
    let worst = 0;
    for (const o of [
      { latitudeDeg: 52.1, longitudeDeg: 4.3 },
      { latitudeDeg: -33.9, longitudeDeg: 151.2 },
      { latitudeDeg: 0.5, longitudeDeg: -78.5 },
    ]) {
      for (let day = 0; day < 365; day += 7) {
        for (let h = 0; h < 24; h += 5) {
          const t = Date.UTC(2026, 0, 1) + day * 86_400_000 + h * 3_600_000;
          worst = Math.max(worst, Math.abs(sunAltitudeDeg(o, t) - aeSunAltitude(o, t)));
        }
      }
    }
    expect(worst).toBeLessThan(0.05);
  });
});

type Brute = { startMs: number; endMs: number; maxEl: number };

/** The plain way: every second, is the craft above 10°, sunlit, with the Sun below −6°? */
function bruteForce(satrec: ReturnType<typeof twoline2satrec>, o: Observer, fromMs: number, toMs: number): Brute[] {
  const geo = { latitude: (o.latitudeDeg * Math.PI) / 180, longitude: (o.longitudeDeg * Math.PI) / 180, height: 0 };
  const out: Brute[] = [];
  let cur: Brute | null = null;
  for (let t = fromMs; t <= toMs; t += 1000) {
    const pv = propagate(satrec, new Date(t));
    if (!pv) continue;
    const la = ecfToLookAngles(geo, eciToEcf(pv.position, gstime(new Date(t))));
    const el = (la.elevation * 180) / Math.PI;
    const vis = el > 10 && sunAltitudeDeg(o, t) < -6 && isSunlit(satrec, t);
    if (vis && !cur) cur = { startMs: t, endMs: t, maxEl: el };
    if (vis && cur) {
      cur.endMs = t;
      cur.maxEl = Math.max(cur.maxEl, el);
    }
    if (!vis && cur) {
      out.push(cur);
      cur = null;
    }
  }
  if (cur) out.push(cur);
  return out;
}

describe('visible passes', () => {
  const scenarios = [
    {
      name: '28057 (sun-synchronous, ~800 km) over a mid-northern site',
      no: '28057',
      o: { latitudeDeg: 51.5, longitudeDeg: -0.1 },
      days: 2,
    },
    {
      name: '06251 (58° inclination, ~380 km perigee) over a southern site',
      no: '06251',
      o: { latitudeDeg: -35.3, longitudeDeg: 149.1 },
      days: 2,
    },
  ];
  for (const s of scenarios) {
    it(`finds the same passes as a 1-second brute-force scan: ${s.name}`, () => {
      const satrec = set(s.no);
      const epochMs = (satrec.jdsatepoch - 2440587.5) * 86_400_000;
      const fromMs = epochMs,
        toMs = epochMs + s.days * 86_400_000;
      const ours = findVisiblePasses({ satrec, observer: s.o, fromMs, toMs });
      const ref = bruteForce(satrec, s.o, fromMs, toMs);
      expect(ref.length).toBeGreaterThan(0);
      expect(ours.length).toBe(ref.length);
      ours.forEach((p, i) => {
        const r = ref[i]!;
        // The scan's answer lies within its 1-second step of the true edge: ours must fall inside that step.
        expect(p.start.atMs).toBeGreaterThan(r.startMs - 1000);
        expect(p.start.atMs).toBeLessThanOrEqual(r.startMs + 1);
        expect(p.end.atMs).toBeGreaterThanOrEqual(r.endMs - 1);
        expect(p.end.atMs).toBeLessThan(r.endMs + 1000);
        expect(Math.abs(p.highest.elevationDeg - r.maxEl)).toBeLessThan(0.1);
        expect(p.highest.elevationDeg).toBeGreaterThan(10);
      });
    });
  }

  it('finds no visible pass when the rule asks for more than the craft can give', () => {
    const satrec = set('28057');
    const epochMs = (satrec.jdsatepoch - 2440587.5) * 86_400_000;
    const passes = findVisiblePasses({
      satrec,
      observer: { latitudeDeg: 51.5, longitudeDeg: -0.1 },
      fromMs: epochMs,
      toMs: epochMs + 86_400_000,
      rule: { minElevationDeg: 89.99, maxSunAltitudeDeg: -6 },
    });
    expect(passes).toEqual([]);
  });
});

describe('compass points', () => {
  it('names azimuths on the 16-point rose (common practice)', () => {
    expect(compassPoint(0)).toBe('N');
    expect(compassPoint(11.2)).toBe('N');
    expect(compassPoint(11.3)).toBe('NNE');
    expect(compassPoint(90)).toBe('E');
    expect(compassPoint(225)).toBe('SW');
    expect(compassPoint(359)).toBe('N');
    expect(compassPoint(-90)).toBe('W');
  });
});

describe('where it is now', () => {
  it('puts the sub-satellite point where satellite.js eciToGeodetic does at a fixed time', () => {
    const satrec = set('28057');
    const t = Date.UTC(2006, 5, 27, 12, 0, 0);
    const pv = propagate(satrec, new Date(t))!;
    const g = eciToGeodetic(pv.position, gstime(new Date(t)));
    const ours = subSatellitePoint(satrec, t)!;
    expect(ours.latitudeDeg).toBeCloseTo(degreesLat(g.latitude), 9);
    expect(ours.longitudeDeg).toBeCloseTo(degreesLong(g.longitude), 9);
    expect(ours.altitudeKm).toBeGreaterThan(780);
    expect(ours.altitudeKm).toBeLessThan(840);
  });

  it('puts the Sun overhead where astronomy-engine does (declination and hour angle), within 0.05°', () => {
    for (const t of [Date.UTC(2026, 2, 20, 12), Date.UTC(2026, 5, 21, 0), Date.UTC(2026, 11, 21, 18, 30)]) {
      const ss = subSolarPoint(t);
      // At the sub-solar point the Sun's altitude is 90°.
      expect(aeSunAltitude(ss, t)).toBeGreaterThan(89.95);
    }
  });
});
