import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { dayOfYearToMs, msToDayOfYear, msToIso, parseCcsdsTime } from '../../shared/orbit';

describe('epoch helpers', () => {
  it('msToIso writes exactly what Date#toISOString writes', () => {
    fc.assert(
      fc.property(fc.double({ min: -6e13, max: 2.5e14, noNaN: true }), (ms) => {
        expect(msToIso(ms)).toBe(new Date(Math.round(ms)).toISOString());
      }),
      { numRuns: 5000 },
    );
    expect(msToIso(NaN)).toBe('');
  });
  it('day-of-year conversions invert each other (day 1.0 = 1 January 00:00 UTC)', () => {
    expect(dayOfYearToMs(2024, 1)).toBe(Date.UTC(2024, 0, 1));
    expect(dayOfYearToMs(2024, 366.5)).toBe(Date.UTC(2024, 11, 31, 12));
    expect(msToDayOfYear(Date.UTC(2023, 11, 31, 18))).toEqual({ fullYear: 2023, dayOfYear: 365.75 });
  });
  it('parses CCSDS calendar and day-of-year times with fractions, and refuses impossible dates', () => {
    expect(parseCcsdsTime('2024-02-29T12:00:00.5')).toBe(Date.UTC(2024, 1, 29, 12, 0, 0, 500));
    expect(parseCcsdsTime('2024-060T12:00:00Z')).toBe(Date.UTC(2024, 1, 29, 12));
    expect(parseCcsdsTime('2023-02-29T00:00:00')).toBeNaN();
    expect(parseCcsdsTime('2023-366T00:00:00')).toBeNaN();
    expect(parseCcsdsTime('2023-01-01T24:00:00')).toBeNaN();
    expect(parseCcsdsTime('tomorrow')).toBeNaN();
  });
});
