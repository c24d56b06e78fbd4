// SGP4 positions against the reference implementation's output: Vallado, Crawford, Hujsak & Kelso,
// "Revisiting Spacetrack Report #3", AIAA 2006-6753 — SGP4-VER.TLE and tcppver.out (WGS-72, TEME).
import { describe, expect, it } from 'vitest';
import { createSatrec, parseElementSets, propagateMinutes, type ElementSet } from '../../shared/orbit';
import { readReferenceOutput, readVerificationCases } from './reference-data';

const cases = readVerificationCases();
const blocks = readReferenceOutput();
const ERROR_CASES = new Set(['33333', '33334', '33335']);

function parseCase(c: (typeof cases)[number], verifyChecksum = true): ElementSet {
  const r = parseElementSets(`${c.line1}\n${c.line2}\n`, { verifyChecksum });
  expect(r.errors).toEqual([]);
  expect(r.records).toHaveLength(1);
  return r.records[0]!;
}

describe('SGP4 verification cases (AIAA 2006-6753)', () => {
  it('pairs every element set with its reference block, in file order', () => {
    expect(cases.length).toBe(blocks.length);
    cases.forEach((c, k) => expect(Number(c.catalogNumber)).toBe(Number(blocks[k]!.catalogNumber)));
  });

  for (const [k, c] of cases.entries()) {
    if (ERROR_CASES.has(c.catalogNumber)) continue;
    const deep = Number(c.line2.slice(52, 63)) < 6.4; // period ≥ 225 min → SDP4 (deep space)
    // The reference prints 1e-8 km. Near Earth we require 1e-7 km (0.1 mm); deep space 1e-6 km, since the
    // 20413 run at 1.84 million minutes accumulates ~1e-7 km of round-off in the resonance integrator.
    const tolKm = deep ? 1e-6 : 1e-7;
    it(`${c.catalogNumber} (${deep ? 'deep space' : 'near Earth'}, line ${c.line1No}) matches tcppver.out within ${tolKm} km`, () => {
      const set = parseCase(c);
      const satrec = createSatrec(set);
      const block = blocks[k]!;
      expect(block.rows.length).toBeGreaterThan(0);
      let worstKm = 0,
        worstKmPerS = 0;
      for (const row of block.rows) {
        const s = propagateMinutes(satrec, row.minutes);
        if (!('positionKm' in s)) throw new Error(`${c.catalogNumber} at ${row.minutes}: ${s.message}`);
        for (let i = 0; i < 3; i++) {
          worstKm = Math.max(worstKm, Math.abs(s.positionKm[i]! - row.r[i]!));
          worstKmPerS = Math.max(worstKmPerS, Math.abs(s.velocityKmPerS[i]! - row.v[i]!));
        }
      }
      expect(worstKm).toBeLessThan(tolKm);
      expect(worstKmPerS).toBeLessThan(tolKm / 100);
    });
  }

  it('33333, 33334 and 33335 fail the checksum as published, naming line and column 69', () => {
    for (const c of cases.filter((x) => ERROR_CASES.has(x.catalogNumber))) {
      const r = parseElementSets(`${c.line1}\n${c.line2}\n`);
      expect(r.records).toHaveLength(0);
      expect(r.errors.length).toBeGreaterThan(0);
      for (const e of r.errors) {
        expect(e.field).toBe('checksum');
        expect(e.columns).toEqual([69, 69]);
        expect([1, 2]).toContain(e.line);
      }
    }
  });

  it('33333 (built for error code 4) propagates to 20 min as the reference does, then fails with a named SGP4 error', () => {
    const c = cases.find((x) => x.catalogNumber === '33333')!;
    const block = blocks[cases.indexOf(c)]!;
    const satrec = createSatrec(parseCase(c, false));
    for (const row of block.rows) {
      const s = propagateMinutes(satrec, row.minutes);
      if (!('positionKm' in s)) throw new Error(s.message);
      for (let i = 0; i < 3; i++) expect(Math.abs(s.positionKm[i]! - row.r[i]!)).toBeLessThan(1e-5);
    }
    const lastMin = block.rows[block.rows.length - 1]!.minutes;
    const failed = propagateMinutes(satrec, lastMin + c.stepMin);
    expect('code' in failed).toBe(true);
    if ('code' in failed) {
      // The set's comment in SGP4-VER.TLE: "check error code 4".
      expect(failed.code).toBe(4);
      expect(failed.name).toBe('semi-latus-rectum-below-zero');
      expect(failed.atMinutes).toBe(lastMin + c.stepMin);
    }
  });

  it('33334 (mean motion 0.00001 rev/day, built for error code 2) fails at epoch with a named SGP4 error', () => {
    const c = cases.find((x) => x.catalogNumber === '33334')!;
    const satrec = createSatrec(parseCase(c, false));
    const s = propagateMinutes(satrec, 0);
    // tcppver.out prints no valid state for 33334 (its one row repeats 33333's last): SGP4 must refuse it.
    expect('code' in s).toBe(true);
    if ('code' in s) {
      expect(s.code).toBeGreaterThan(0);
      expect(s.name).toMatch(/^[a-z-]+$/);
    }
  });

  it('33335 (built to try error code 3; the reference found none) matches the reference output over its whole span', () => {
    const c = cases.find((x) => x.catalogNumber === '33335')!;
    const block = blocks[cases.indexOf(c)]!;
    const satrec = createSatrec(parseCase(c, false));
    expect(block.rows[block.rows.length - 1]!.minutes).toBe(c.stopMin);
    for (const row of block.rows) {
      const s = propagateMinutes(satrec, row.minutes);
      if (!('positionKm' in s)) throw new Error(s.message);
      for (let i = 0; i < 3; i++) expect(Math.abs(s.positionKm[i]! - row.r[i]!)).toBeLessThan(1e-5);
    }
  });
});
