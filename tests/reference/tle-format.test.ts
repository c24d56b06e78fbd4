// Two-line element set format rules (REFERENCES.md §2: the published column layout, checksum, epoch year rule,
// alpha-5 catalog numbers).
import { describe, expect, it } from 'vitest';
import { formatCatalogNumber, parseCatalogNumber, parseElementSets, tleChecksum, tleYearToFullYear, writeTle } from '../../shared/orbit';

const L1 = '1 00005U 58002B   00179.78495062  .00000023  00000-0  28098-4 0  4753';
const L2 = '2 00005  34.2682 348.7242 1859667 331.7664  19.3264 10.82419157413667';

describe('TLE checksum (modulo 10, digits and "-" = 1)', () => {
  it('gives 3 for the published example line 1 of 00005', () => {
    expect(tleChecksum(L1)).toBe(3);
    expect(L1[68]).toBe('3');
  });
  it('counts each minus sign as 1', () => {
    const base = '1 04632U 70093B   04031.91070959 -.00000084  00000-0  10000-3 0  995';
    let digits = 0,
      minus = 0;
    for (const ch of base) {
      if (ch >= '0' && ch <= '9') digits += Number(ch);
      if (ch === '-') minus++;
    }
    expect(minus).toBe(3);
    expect(tleChecksum(base)).toBe((digits + minus) % 10);
    expect(tleChecksum(base)).toBe(5); // the published line ends "9955"
  });
});

describe('the published 00005 example parses field by field', () => {
  const r = parseElementSets(`${L1}\n${L2}\n`);
  const s = r.records[0]!;
  it('has no errors', () => expect(r.errors).toEqual([]));
  it('reads the line-1 fields, with ṅ/2 as published and the assumed-decimal B*', () => {
    expect(s.catalogNumber).toBe('00005');
    expect(s.classification).toBe('U');
    expect(s.internationalDesignator).toBe('58002B');
    expect(s.meanMotionDotRevPerDay2).toBe(0.00000023);
    expect(s.meanMotionDdotRevPerDay3).toBe(0);
    expect(s.bstar).toBeCloseTo(0.28098e-4, 15);
    expect(s.elementSetNo).toBe(475);
  });
  it('reads the line-2 fields with the assumed leading "0." of the eccentricity', () => {
    expect(s.inclinationDeg).toBe(34.2682);
    expect(s.raanDeg).toBe(348.7242);
    expect(s.eccentricity).toBe(0.1859667);
    expect(s.argPerigeeDeg).toBe(331.7664);
    expect(s.meanAnomalyDeg).toBe(19.3264);
    expect(s.meanMotionRevPerDay).toBe(10.82419157);
    expect(s.revAtEpoch).toBe(41366);
  });
  it('epoch 00179.78495062 is 2000 day 179 (27 June) 18:50:19.734 UTC', () => {
    // tcppver.out prints the 00005 epoch + 360 min as 2000-06-28 00:50:19.733571.
    expect(s.epoch).toBe('2000-06-27T18:50:19.734Z');
    expect(Math.abs(s.epochMs + 360 * 60_000 - (Date.UTC(2000, 5, 28, 0, 50, 19, 733) + 0.571))).toBeLessThan(0.01);
  });
  it('writes back the identical two lines', () => {
    expect(writeTle(s)).toEqual({ line1: L1, line2: L2 });
  });
  it('reads negative exponent fields (16925: n̈/6 = −30915-6 = −0.30915e-6)', () => {
    const r2 = parseElementSets(
      '1 16925U 86065D   06151.67415771  .02550794 -30915-6  18784-3 0  4486\n2 16925  62.0906 295.0239 5596327 245.1593  47.9690  4.88511875148616\n',
    );
    expect(r2.errors).toEqual([]);
    expect(r2.records[0]!.meanMotionDdotRevPerDay3).toBeCloseTo(-0.30915e-6, 18);
    expect(r2.records[0]!.bstar).toBeCloseTo(0.18784e-3, 16);
  });
});

describe('epoch year rule: 57–99 → 19xx, 00–56 → 20xx', () => {
  it.each([
    [57, 1957],
    [99, 1999],
    [0, 2000],
    [56, 2056],
    [24, 2024],
  ])('%i → %i', (yy, full) => {
    expect(tleYearToFullYear(yy)).toBe(full);
  });
  it('applies in the parser: 57001.0 is 1 Jan 1957, 56001.0 is 1 Jan 2056', () => {
    for (const [yy, iso] of [
      ['57', '1957-01-01T00:00:00.000Z'],
      ['56', '2056-01-01T00:00:00.000Z'],
    ] as const) {
      const set = { ...parseElementSets(`${L1}\n${L2}`).records[0]! };
      set.epochMs = Date.parse(iso);
      const { line1, line2 } = writeTle(set);
      expect(line1.slice(18, 32)).toBe(`${yy}001.00000000`);
      expect(parseElementSets(`${line1}\n${line2}`).records[0]!.epoch).toBe(iso);
    }
  });
  it('rejects day 366 in a common year and accepts it in a leap year', () => {
    const mk = (yyddd: string) => {
      const l1 = L1.slice(0, 18) + yyddd + L1.slice(32, 68);
      return `${l1}${tleChecksum(l1)}\n${L2}`;
    };
    expect(parseElementSets(mk('01366.50000000')).errors[0]).toMatchObject({ line: 1, columns: [21, 32], field: 'epoch day' });
    expect(parseElementSets(mk('00366.50000000')).records[0]!.epoch).toBe('2000-12-31T12:00:00.000Z');
  });
});

describe('alpha-5 catalog numbers (letter for 10…33, I and O skipped)', () => {
  it.each([
    ['A0000', 100000],
    ['B1234', 111234],
    ['H9999', 179999],
    ['J0000', 180000],
    ['N0001', 220001],
    ['P0000', 230000],
    ['Z9999', 339999],
  ])('%s = %i and back', (text, n) => {
    expect(parseCatalogNumber(text)).toBe(n);
    expect(formatCatalogNumber(n)).toBe(text);
  });
  it('rejects I and O', () => {
    expect(parseCatalogNumber('I0000')).toBeNaN();
    expect(parseCatalogNumber('O0000')).toBeNaN();
  });
  it('parses and writes an alpha-5 set with both lines agreeing', () => {
    const set = { ...parseElementSets(`${L1}\n${L2}`).records[0]!, catalogNumber: 'T0042', catalogNumberInt: 270042 };
    const { line1, line2 } = writeTle(set);
    expect(line1.slice(2, 7)).toBe('T0042');
    const back = parseElementSets(`${line1}\n${line2}`);
    expect(back.errors).toEqual([]);
    expect(back.records[0]).toMatchObject({ catalogNumber: 'T0042', catalogNumberInt: 270042 });
  });
});
