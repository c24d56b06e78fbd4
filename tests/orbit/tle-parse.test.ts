// Two-/three-line parsing: layout, blank lines and CRLF, and errors that name line, columns, field and expectation.
import { describe, expect, it } from 'vitest';
import { parseElementSets, tleChecksum } from '../../shared/orbit';

const L1 = '1 00005U 58002B   00179.78495062  .00000023  00000-0  28098-4 0  4753';
const L2 = '2 00005  34.2682 348.7242 1859667 331.7664  19.3264 10.82419157413667';
const M1 = '1 06251U 62025E   06176.82412014  .00008885  00000-0  12808-3 0  3985';
const M2 = '2 06251  58.0579  54.0425 0030035 139.1568 221.1854 15.56387291  6774';

/** Replaces columns [from, to] (1-based) and fixes the checksum. */
function patch(line: string, from: number, text: string): string {
  const body = (line.slice(0, from - 1) + text + line.slice(from - 1 + text.length)).slice(0, 68);
  return body + tleChecksum(body);
}

describe('two- and three-line files', () => {
  it('reads names, blank lines, CRLF, comments and "0 " name prefixes', () => {
    const text = `# comment\r\nTERN ONE\r\n${L1}\r\n${L2}\r\n\r\n\r\n0 SECOND\r\n${M1}\r\n${M2}\r\n${L1}\n${L2}`;
    const r = parseElementSets(text);
    expect(r.format).toBe('tle');
    expect(r.errors).toEqual([]);
    expect(r.records.map((x) => [x.name, x.catalogNumber, x.sourceLine])).toEqual([
      ['TERN ONE', '00005', 2],
      ['SECOND', '06251', 7],
      [undefined, '00005', 10],
    ]);
  });
  it('parses thousands of sets', () => {
    const text = Array.from({ length: 5000 }, () => `${L1}\n${L2}`).join('\n');
    const r = parseElementSets(text);
    expect(r.records).toHaveLength(5000);
    expect(r.records[4999]!.sourceLine).toBe(9999);
  });
});

describe('errors name line, columns, field and what was expected', () => {
  const cases: Array<[string, string, string, Partial<{ line: number; columns: [number, number]; field: string }>]> = [
    ['wrong checksum on line 2', L1, L2.slice(0, 68) + '0', { line: 2, columns: [69, 69], field: 'checksum' }],
    ['eccentricity with a letter', L1, patch(L2, 27, '18x9667'), { line: 2, columns: [27, 33], field: 'eccentricity' }],
    ['inclination above 180°', L1, patch(L2, 9, '181.0000'), { line: 2, columns: [9, 16], field: 'inclination' }],
    ['mean motion zero', L1, patch(L2, 53, ' 0.00000000'), { line: 2, columns: [53, 63], field: 'mean motion' }],
    ['catalog numbers differ', L1, patch(L2, 3, '00006'), { line: 2, columns: [3, 7], field: 'catalog number' }],
    ['bad B* exponent', patch(L1, 54, ' 28098x4'), L2, { line: 1, columns: [54, 61], field: 'B*' }],
    ['bad epoch day', patch(L1, 21, '400.00000000'), L2, { line: 1, columns: [21, 32], field: 'epoch day' }],
    ['shifted fields', patch(L1, 33, 'X'), L2, { line: 1, columns: [33, 33], field: 'separator' }],
    ['line 1 truncated', L1.slice(0, 50), L2, { line: 1, columns: [1, 50], field: 'line 1' }],
  ];
  for (const [what, a, b, expected] of cases) {
    it(what, () => {
      const r = parseElementSets(`${a}\n${b}\n`, { format: 'tle' });
      expect(r.records).toHaveLength(0);
      expect(r.errors[0]).toMatchObject(expected);
      expect(r.errors[0]!.message.length).toBeGreaterThan(5);
      expect(r.errors[0]!.expected).toBeTruthy();
    });
  }
  it('swapped lines: both are reported, good sets around them are kept', () => {
    const r = parseElementSets(`${M1}\n${M2}\n${L2}\n${L1}\n${M1}\n${M2}\n`);
    expect(r.records).toHaveLength(2);
    expect(r.errors.map((e) => e.line)).toEqual([3, 4]);
    expect(r.errors[0]!.message).toMatch(/line 2 without a line 1/);
    expect(r.errors[1]!.message).toMatch(/line 1 is not followed by line 2/);
  });
  it('a name line followed by nothing useful is reported', () => {
    const r = parseElementSets(`${L1}\n${L2}\nORPHAN NAME\n`);
    expect(r.records).toHaveLength(1);
    expect(r.errors).toEqual([expect.objectContaining({ line: 3, field: 'name' })]);
  });
  it('verifyChecksum: false accepts a wrong checksum but still validates the fields', () => {
    expect(parseElementSets(`${L1}\n${L2.slice(0, 68)}0`, { verifyChecksum: false }).records).toHaveLength(1);
  });
  it('caps the error list with a summary entry', () => {
    const text = Array.from({ length: 50 }, () => `${L1}\n${L2.slice(0, 68)}0`).join('\n');
    const r = parseElementSets(text, { maxErrors: 10 });
    expect(r.errors).toHaveLength(11);
    expect(r.errors[10]!.message).toBe('40 more errors not listed');
  });
});

describe('a letter in a numeric field is named as well as the checksum it breaks', () => {
  // "34.2682" → "3A.2682": the letter counts 0 in the checksum (published TLE checksum rule), so the stated
  // checksum no longer matches; the user must learn which field holds the letter, not only that the sum is off.
  const bad = L2.slice(0, 8) + ' 3A.2682' + L2.slice(16);
  it('reports the inclination first, then the checksum, and keeps no record', () => {
    const r = parseElementSets(`${L1}\n${bad}\n`, { format: 'tle' });
    expect(r.records).toHaveLength(0);
    expect(r.errors.map((e) => [e.line, e.field, e.columns])).toEqual([
      [2, 'inclination', [9, 16]],
      [2, 'checksum', [69, 69]],
    ]);
    expect(r.errors[0]!.message).toBe('" 3A.2682" is not a number');
    expect(r.errors[1]!.message).toBe('checksum is 7 but columns 1–68 give 3');
  });
  it('a letter on line 1 (B*) and a wrong checksum on line 2: fields first, then each checksum', () => {
    const b1 = L1.slice(0, 53) + ' 2809B-4' + L1.slice(61);
    const r = parseElementSets(`${b1}\n${L2.slice(0, 68)}0\n`, { format: 'tle' });
    expect(r.errors.map((e) => [e.line, e.field])).toEqual([
      [1, 'B*'],
      [1, 'checksum'],
      [2, 'checksum'],
    ]);
  });
  it('with checksums not verified, the field error alone', () => {
    const r = parseElementSets(`${L1}\n${bad}\n`, { format: 'tle', verifyChecksum: false });
    expect(r.errors.map((e) => e.field)).toEqual(['inclination']);
  });
});
