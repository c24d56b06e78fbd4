// Every CSV the product writes goes through one helper that quotes by RFC 4180 and neutralises cells a
// spreadsheet would run as a formula (OWASP, "CSV Injection": prefix cells starting with = + - @ tab or CR
// with a single quote).
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import Papa from 'papaparse';
import { toCsv } from '../../server/lib/csv';
import type { Agent, TestApp } from '../setup/test-app';
import { importUpload, orbitDesk, tern1Set, tleLines, uploadAndPreview } from './orbit-helpers';

describe('toCsv', () => {
  const columns = [
    { header: 'name', value: (r: { name: string; n: number | string }) => r.name },
    { header: 'n', value: (r: { name: string; n: number | string }) => r.n },
  ];

  it('prefixes cells that a spreadsheet would run with a single quote', () => {
    const risky = ['=1+2', '+1+2', '-1+2', '@SUM(A1)', '\t=1', '\r=1', '=HYPERLINK("http://x.example","open")'];
    const csv = toCsv(
      risky.map((name) => ({ name, n: 1 })),
      columns,
    );
    const rows = Papa.parse<string[]>(csv.trim(), { newline: '\r\n' }).data;
    expect(rows[0]).toEqual(['name', 'n']);
    expect(rows.slice(1).map((r) => r[0])).toEqual(risky.map((v) => `'${v}`));
  });

  it('leaves numbers, plain text and numeric text alone, and quotes commas, quotes and line breaks', () => {
    const csv = toCsv(
      [
        { name: 'Tern-1, "first" sail\nline two', n: -12.5 },
        { name: 'tern-1.tle', n: '-2.10000e-3' },
        { name: 'a-b', n: '+7' },
      ],
      columns,
    );
    expect(csv.startsWith('name,n\r\n')).toBe(true);
    expect(csv.endsWith('\r\n')).toBe(true);
    const rows = Papa.parse<string[]>(csv.trim(), { newline: '\r\n' }).data;
    expect(rows.slice(1)).toEqual([
      ['Tern-1, "first" sail\nline two', '-12.5'],
      ['tern-1.tle', '-2.10000e-3'],
      ['a-b', '+7'],
    ]);
    expect(csv).toContain('"Tern-1, ""first"" sail\nline two"');
  });
});

describe('the history CSV', () => {
  let t: TestApp;
  let engineer: Agent;
  let craftId: string;
  // A path in a file name is cut to its last part on upload, so the formula holds no slash.
  const formula = '=HYPERLINK("attacker.example","open").tle';
  beforeAll(async () => {
    ({ t, engineer, spacecraftId: craftId } = await orbitDesk());
    const preview = await uploadAndPreview(engineer, craftId, tleLines([tern1Set(10, 101), tern1Set(11, 102)]).join('\n'), formula);
    await importUpload(engineer, preview.id);
  }, 60_000);
  afterAll(async () => t?.close());

  it('holds a file name that looks like a formula as inert text', async () => {
    const res = await engineer.get(`/api/orbit/spacecraft/${craftId}/element-sets.csv`).query({ dir: 'asc' }).expect(200);
    const rows = Papa.parse<Record<string, string>>(res.text.trim(), { header: true, newline: '\r\n' }).data;
    expect(rows).toHaveLength(2);
    expect(rows.map((r) => r.source_file)).toEqual([`'${formula}`, `'${formula}`]);
    // Numeric columns stay numbers a spreadsheet can add up.
    expect(Number(rows[0]!.bstar_per_earth_radius)).toBeCloseTo(2.1e-3, 8);
    expect(rows.map((r) => r.element_set_no)).toEqual(['101', '102']);
  });
});
