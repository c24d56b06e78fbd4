// Writer ⇄ parser round trips over generated element sets (fast-check).
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { formatCatalogNumber, formatTleFile, parseElementSets, writeTle, type TleWriteInput } from '../../shared/orbit';

const setArb: fc.Arbitrary<TleWriteInput> = fc.record({
  catalogNumber: fc.integer({ min: 0, max: 339_999 }).map(formatCatalogNumber),
  classification: fc.constantFrom('U' as const, 'C' as const, 'S' as const),
  internationalDesignator: fc.constantFrom('', '25951C', '98967A', '24923ABC') /* fictional: launch numbers above any year's count */,
  // 1957-01-01 … 2056-12-30
  epochMs: fc.double({ min: Date.UTC(1957, 0, 1), max: Date.UTC(2056, 11, 30), noNaN: true }),
  meanMotionRevPerDay: fc.double({ min: 0.05, max: 17, noNaN: true }),
  meanMotionDotRevPerDay2: fc.double({ min: -0.5, max: 0.5, noNaN: true }),
  meanMotionDdotRevPerDay3: fc.oneof(fc.constant(0), fc.double({ min: -1e-3, max: 1e-3, noNaN: true })),
  bstar: fc.oneof(fc.constant(0), fc.double({ min: -0.5, max: 0.5, noNaN: true })),
  inclinationDeg: fc.double({ min: 0, max: 180, noNaN: true }),
  raanDeg: fc.double({ min: 0, max: 359.9999, noNaN: true }),
  eccentricity: fc.double({ min: 0, max: 0.99, noNaN: true }),
  argPerigeeDeg: fc.double({ min: 0, max: 359.9999, noNaN: true }),
  meanAnomalyDeg: fc.double({ min: 0, max: 359.9999, noNaN: true }),
  elementSetNo: fc.integer({ min: 0, max: 9999 }),
  revAtEpoch: fc.integer({ min: 0, max: 99_999 }),
});

describe('TLE writer and parser round trip', () => {
  it('any set written is parsed back within the precision of each field, checksums right', () => {
    fc.assert(
      fc.property(setArb, (s) => {
        const { line1, line2 } = writeTle(s);
        expect(line1).toHaveLength(69);
        expect(line2).toHaveLength(69);
        const r = parseElementSets(`${line1}\n${line2}\n`);
        expect(r.errors).toEqual([]);
        const p = r.records[0]!;
        expect(p.catalogNumber).toBe(s.catalogNumber);
        expect(p.classification).toBe(s.classification);
        expect(p.internationalDesignator).toBe(s.internationalDesignator);
        expect(Math.abs(p.epochMs - s.epochMs)).toBeLessThanOrEqual(0.5e-8 * 86_400_000 + 1e-3);
        expect(Math.abs(p.meanMotionRevPerDay - s.meanMotionRevPerDay)).toBeLessThanOrEqual(0.5e-8 + 1e-12);
        expect(Math.abs(p.meanMotionDotRevPerDay2 - s.meanMotionDotRevPerDay2)).toBeLessThanOrEqual(0.5e-8 + 1e-15);
        expect(Math.abs(p.eccentricity - s.eccentricity)).toBeLessThanOrEqual(0.5e-7 + 1e-15);
        expect(Math.abs(p.inclinationDeg - s.inclinationDeg)).toBeLessThanOrEqual(0.5e-4 + 1e-12);
        for (const k of ['raanDeg', 'argPerigeeDeg', 'meanAnomalyDeg'] as const) {
          const d = Math.abs(p[k] - s[k]);
          expect(Math.min(d, 360 - d)).toBeLessThanOrEqual(0.5e-4 + 1e-9);
        }
        for (const k of ['bstar', 'meanMotionDdotRevPerDay3'] as const) {
          // Five significant digits, or zero below 1e-10.
          expect(Math.abs(p[k] - s[k])).toBeLessThanOrEqual(Math.abs(s[k]) * 0.6e-4 + 1e-10);
        }
        expect(p.elementSetNo).toBe(s.elementSetNo);
        expect(p.revAtEpoch).toBe(s.revAtEpoch);
        // Writing the parsed set gives the same lines again.
        expect(writeTle(p)).toEqual({ line1, line2 });
      }),
      { numRuns: 2000 },
    );
  });

  it('formatTleFile with names round-trips a whole file', () => {
    fc.assert(
      fc.property(
        fc.array(
          setArb.map((s) => ({ ...s, name: `CRAFT ${s.catalogNumber}` })),
          { minLength: 1, maxLength: 30 },
        ),
        (sets) => {
          const text = formatTleFile(sets, { withNames: true });
          const r = parseElementSets(text);
          expect(r.errors).toEqual([]);
          expect(r.records.map((x) => x.name)).toEqual(sets.map((x) => x.name));
          expect(r.records.map((x) => x.sourceLine)).toEqual(sets.map((_, i) => 3 * i + 1));
        },
      ),
      { numRuns: 200 },
    );
  });
});
