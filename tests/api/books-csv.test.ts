import { describe, expect, it } from 'vitest';
import Papa from 'papaparse';
import { recordsToCsv } from '../../server/lib/csv';

// Cells a spreadsheet would run as formulas start with = + - @, tab or CR (OWASP, "CSV Injection").
describe('recordsToCsv (books exports)', () => {
  it('neutralises formula cells with a leading apostrophe and quotes what needs quoting', () => {
    const rows = [
      { a: '=HYPERLINK("http://x","y")', b: '+1', c: '-2+3', d: '@SUM(A1)' },
      { a: '\tTAB', b: '\rCR', c: 'plain, with comma', d: 'say "hi"' },
      { a: -1500, b: null, c: 'line\nbreak', d: 'ok' },
    ];
    const csv = recordsToCsv(rows, ['a', 'b', 'c', 'd']);
    expect(csv.split('\r\n')[0]).toBe('a,b,c,d');
    const parsed = Papa.parse<string[]>(csv, { skipEmptyLines: true }).data;
    expect(parsed.slice(1)).toEqual([
      [`'=HYPERLINK("http://x","y")`, '+1', "'-2+3", "'@SUM(A1)"],
      ["'\tTAB", "'\rCR", 'plain, with comma', 'say "hi"'],
      ['-1500', '', 'line\nbreak', 'ok'],
    ]);
    expect(csv).toContain('"\'=HYPERLINK(""http://x"",""y"")"');
  });
});
