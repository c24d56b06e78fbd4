// Sail and drag physics against published values (REFERENCES.md §4–6).
import { describe, expect, it } from 'vitest';
import {
  AU_M,
  atmosphericDensityKgPerM3,
  characteristicAccelerationMPerS2,
  circularSpeedMPerS,
  crossoverAltitudeKm,
  dragForceN,
  orbitEnergyBalance,
  photonMomentumKgMPerS,
  sailForceN,
  sailPressurePa,
  sailThrustGeometry,
  solarIrradianceWPerM2,
  solarRadiationPressurePa,
  sunlitFraction,
  usableThrustFraction,
  betaAngleDeg,
  harrisPriesterDensityKgPerM3,
  cira72ExponentialDensityKgPerM3,
  sunlightAtEpoch,
} from '../../shared/orbit';

function expectRelative(actual: number, expected: number, tol = 1e-9) {
  expect(Math.abs(actual - expected) / Math.abs(expected)).toBeLessThan(tol);
}

describe('radiation pressure and photon momentum', () => {
  it('sail pressure at 1 AU ≈ 4.56 µN/m² absorbed and ≈ 9.12 µN/m² ideal reflector (McInnes, Solar Sailing, 1999 — from memory)', () => {
    // McInnes' figures follow from S ≈ 1368 W/m²; with it we reproduce them to the printed digits.
    expect(sailPressurePa(0, 1, 1368) * 1e6).toBeCloseTo(4.56, 2);
    expect(sailPressurePa(1, 1, 1368) * 1e6).toBeCloseTo(9.13, 2);
    // With Kopp & Lean 2011 (1360.8 W/m², our default) S/c = 4.54 and 2S/c = 9.08 µN/m² (REFERENCES.md §4), within 0.5 % of McInnes.
    expect(solarRadiationPressurePa() * 1e6).toBeCloseTo(4.539, 3);
    expect(sailPressurePa(1) * 1e6).toBeCloseTo(9.078, 3);
    expect(Math.abs(solarRadiationPressurePa() * 1e6 - 4.56) / 4.56).toBeLessThan(0.005);
    expect(Math.abs(sailPressurePa(1) * 1e6 - 9.12) / 9.12).toBeLessThan(0.005);
  });

  it('photon momentum at 500 nm ≈ 1.3×10⁻²⁷ kg·m/s (p = h/λ, CODATA 2018 h = 6.62607015e-34 J·s)', () => {
    const p = photonMomentumKgMPerS(500e-9);
    expectRelative(p, 6.62607015e-34 / 500e-9, 1e-15);
    expect(Number(p.toPrecision(2))).toBe(1.3e-27);
  });

  it('inverse square: ¼ at 2 AU, 1/9 at 3 AU; 1 AU is 149 597 870 700 m (IAU 2012 B2)', () => {
    const s1 = solarIrradianceWPerM2(1);
    expect(s1).toBe(1360.8);
    expect(solarIrradianceWPerM2(2) / s1).toBeCloseTo(1 / 4, 12);
    expect(solarIrradianceWPerM2(3) / s1).toBeCloseTo(1 / 9, 12);
    expect(solarRadiationPressurePa(2) / solarRadiationPressurePa(1)).toBeCloseTo(1 / 4, 12);
    expect(AU_M).toBe(149_597_870_700);
  });

  it('ideal reflector F = 2·P·A·cos²θ (McInnes 1999): cos² dependence at 30°, 45°, 60°, 90°', () => {
    const sail = { sailAreaM2: 24, reflectivity: 1 };
    const f0 = sailForceN(sail, 0).normalN;
    expectRelative(f0, 2 * solarRadiationPressurePa() * 24);
    for (const deg of [30, 45, 60]) {
      const th = (deg * Math.PI) / 180;
      const f = sailForceN(sail, th);
      expect(f.normalN / f0).toBeCloseTo(Math.cos(th) ** 2, 12);
      expect(f.tangentialN).toBe(0);
    }
    expect(sailForceN(sail, Math.PI / 2).normalN).toBeCloseTo(0, 20);
  });

  it('absorber: F = P·A·cosθ along the Sun line', () => {
    const th = Math.PI / 3;
    const f = sailForceN({ sailAreaM2: 10, reflectivity: 0 }, th);
    expectRelative(f.magnitudeN, solarRadiationPressurePa() * 10 * Math.cos(th));
  });

  it("characteristic acceleration a0 = 2ηP/σ: an ideal sail at the critical loading ≈ 1.53 g/m² gives ≈ 5.93 mm/s², the Sun's gravity at 1 AU (McInnes 1999 — from memory)", () => {
    const a0 = characteristicAccelerationMPerS2({ massKg: 1.53e-3, sailAreaM2: 1, reflectivity: 1 });
    expect(a0 * 1e3).toBeCloseTo(5.93, 1);
    // Tern-1 (4.8 kg, 24 m², ideal): 2·P/σ with σ = 0.2 kg/m².
    expectRelative(
      characteristicAccelerationMPerS2({ massKg: 4.8, sailAreaM2: 24, reflectivity: 1 }),
      (2 * solarRadiationPressurePa()) / 0.2,
    );
  });
});

describe('density models', () => {
  it('CIRA-72 exponential table reproduces its rows (Vallado 2013, REFERENCES.md §5)', () => {
    expect(cira72ExponentialDensityKgPerM3(500)).toBe(6.967e-13);
    expect(cira72ExponentialDensityKgPerM3(800)).toBe(1.17e-14);
    expectRelative(cira72ExponentialDensityKgPerM3(650), 1.454e-13 * Math.exp(-50 / 71.835));
  });
  it('Harris–Priester rows and exponential interpolation between them (Montenbruck & Gill 2000)', () => {
    expectRelative(harrisPriesterDensityKgPerM3(800, 'max'), 8.059e-14);
    expectRelative(harrisPriesterDensityKgPerM3(800, 'min'), 7.069e-15);
    const mid = harrisPriesterDensityKgPerM3(810, 'max');
    expectRelative(mid, 8.059e-14 * (5.741e-14 / 8.059e-14) ** (10 / 40));
    expect(mid).toBeLessThan(8.059e-14);
    expect(mid).toBeGreaterThan(5.741e-14);
  });
  it('orders low < mean < high activity from 300 to 1000 km, and sits within a factor 3 of US Standard Atmosphere 1976 at 500 and 1000 km', () => {
    for (let h = 300; h <= 1000; h += 50) {
      expect(atmosphericDensityKgPerM3(h, 'low')).toBeLessThan(atmosphericDensityKgPerM3(h, 'mean'));
      expect(atmosphericDensityKgPerM3(h, 'mean')).toBeLessThan(atmosphericDensityKgPerM3(h, 'high'));
    }
    // US Standard Atmosphere 1976: 5.215e-13 (500 km), 3.561e-15 (1000 km).
    expect(atmosphericDensityKgPerM3(500, 'mean') / 5.215e-13).toBeGreaterThan(1 / 3);
    expect(atmosphericDensityKgPerM3(500, 'mean') / 5.215e-13).toBeLessThan(3);
    expect(atmosphericDensityKgPerM3(1000, 'mean') / 3.561e-15).toBeGreaterThan(1 / 3);
    expect(atmosphericDensityKgPerM3(1000, 'mean') / 3.561e-15).toBeLessThan(3);
  });
  it('drag ½ρv²C_dA', () => {
    expectRelative(dragForceN(1e-12, 7600, 2.2, 24), 0.5 * 1e-12 * 7600 ** 2 * 2.2 * 24);
  });
});

describe('sunlight and usable thrust', () => {
  it('with half the orbit in shadow the usable-thrust fraction is ¼ (common practice)', () => {
    expect(usableThrustFraction({ sunlitFraction: 0.5 })).toBe(0.25);
    expect(usableThrustFraction({ sunlitFraction: 1 })).toBe(0.5);
  });
  it('sampling a low orbit (200 km, Sun in the plane) agrees: ~42 % shadow, usable = sunlit/2 ≈ 0.29, close to ¼', () => {
    const g = sailThrustGeometry({ altitudeKm: 200, betaDeg: 0, samples: 36_000 });
    expect(g.sunlitFraction).toBeCloseTo(sunlitFraction({ altitudeKm: 200 }), 3);
    expect(g.usableFraction).toBeCloseTo(g.sunlitFraction / 2, 3);
    expect(g.usableFraction).toBeGreaterThan(0.25);
    expect(g.usableFraction).toBeLessThan(0.3);
  });
  it('cylindrical shadow: none when |β| exceeds asin(R/r); at β = 0 the shadow is asin(R/r)/π', () => {
    const r = 6378.137 + 780;
    expect(sunlitFraction({ altitudeKm: 780, betaDeg: 0 })).toBeCloseTo(1 - Math.asin(6378.137 / r) / Math.PI, 12);
    expect(sunlitFraction({ altitudeKm: 780, betaDeg: 70 })).toBe(1);
  });
  it('β angle from the Sun direction (astronomy-engine): near the equinox an equatorial orbit sees the Sun in its plane', () => {
    expect(Math.abs(betaAngleDeg({ epochMs: Date.UTC(2025, 2, 20, 9), inclinationDeg: 0, raanDeg: 0 }))).toBeLessThan(0.5);
    // At the June solstice the Sun is 23.44° north of the equator.
    expect(betaAngleDeg({ epochMs: Date.UTC(2025, 5, 21, 3), inclinationDeg: 0, raanDeg: 0 })).toBeCloseTo(23.44, 1);
  });
  it('a dawn–dusk orbit (RAAN 90° from the Sun at the equinox, i = 98°) sees β near 90° − 8° and no shadow at 780 km', () => {
    const s = sunlightAtEpoch({ epochMs: Date.UTC(2025, 2, 20, 9), inclinationDeg: 98, raanDeg: 270, altitudeKm: 780 });
    expect(Math.abs(Math.abs(s.betaDeg) - 82)).toBeLessThan(1);
    expect(s.sunlitFraction).toBe(1);
    expect(s.usableThrustFraction).toBe(0.5);
  });
});

describe('crossover altitude: sail energy gain equals drag loss (common practice bands)', () => {
  // Assumptions for every check below: ideal reflective sail (reflectivity 1), sail area = drag area = 24 m²,
  // mass 4.8 kg (cancels out), C_d = 2.2, 1 AU, circular orbit, Sun in the orbit plane (β = 0, longest shadow).
  // Orbit-averaged: gain = 2·P·A·v·⟨cos²θ⟩ over the sunlit part where the craft recedes from the Sun (sail
  // normal along the velocity), loss = ½·ρ·v³·C_d·A all the way round.
  const craft = { massKg: 4.8, sailAreaM2: 24, dragAreaM2: 24, dragCoefficient: 2.2, reflectivity: 1 };

  it('high activity (Harris–Priester maximum): between 800 and 1000 km', () => {
    const h = crossoverAltitudeKm(craft, { density: 'harris-priester-max' })!;
    expect(h).toBeGreaterThan(800);
    expect(h).toBeLessThan(1000);
    const b = orbitEnergyBalance(craft, h, { density: 'harris-priester-max' });
    expect(Math.abs(b.netWPerKg)).toBeLessThan(1e-4 * b.dragLossWPerKg);
  });
  it('mean activity (CIRA-72 exponential table): lower, between 650 and 750 km', () => {
    const h = crossoverAltitudeKm(craft, { density: 'cira72-exponential' })!;
    expect(h).toBeGreaterThan(650);
    expect(h).toBeLessThan(750);
    expect(h).toBeLessThan(crossoverAltitudeKm(craft, { density: 'harris-priester-max' })!);
  });
  it('instantaneous (sail square to both the Sun and the flow, mean activity): lower still, near 600 km', () => {
    const h = crossoverAltitudeKm(craft, { density: 'mean', mode: 'instantaneous' })!;
    expect(Math.abs(h - 600)).toBeLessThan(25);
    // Check by hand: 2·P·A = ½·ρ·v²·C_d·A at the crossover.
    const rho = atmosphericDensityKgPerM3(h, 'mean');
    const v = circularSpeedMPerS(h);
    expectRelative(2 * solarRadiationPressurePa(), 0.5 * rho * v * v * 2.2, 1e-4);
  });
  it('orbit-average factor ⟨cos²θ⟩: ¼ without shadow (half the orbit receding × mean sin² of ½)', () => {
    const g = sailThrustGeometry({ altitudeKm: 780, betaDeg: 80, samples: 36_000 });
    expect(g.sunlitFraction).toBe(1);
    const g0 = sailThrustGeometry({ altitudeKm: 100_000, betaDeg: 0, samples: 36_000 });
    expect(g0.meanAlongTrackCos2).toBeGreaterThan(0.24);
    expect(g0.meanAlongTrackCos2).toBeLessThan(0.25);
  });
});
