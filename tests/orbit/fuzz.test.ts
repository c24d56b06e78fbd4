// Every parser on hostile input (fast-check): random bytes, truncated and swapped lines, wrong checksums, NaN and
// out-of-range fields, huge inputs. Each input yields records and named errors only: no exception, and no record
// with a non-finite number.
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  formatTleFile,
  parseElementSets,
  parseOmmCsv,
  parseOmmJson,
  parseOmmKvn,
  parseOmmXml,
  parseTleText,
  type ElementSet,
  type ParseError,
} from '../../shared/orbit';

const L1 = '1 00005U 58002B   00179.78495062  .00000023  00000-0  28098-4 0  4753';
const L2 = '2 00005  34.2682 348.7242 1859667 331.7664  19.3264 10.82419157413667';
const M1 = '1 06251U 62025E   06176.82412014  .00008885  00000-0  12808-3 0  3985';
const M2 = '2 06251  58.0579  54.0425 0030035 139.1568 221.1854 15.56387291  6774';
const GOOD_TLE = `NAME A\n${L1}\n${L2}\n${M1}\n${M2}\n`;
const KVN =
  'CCSDS_OMM_VERS = 2.0\nOBJECT_NAME = X\nOBJECT_ID = 1958-002B\nEPOCH = 2000-06-27T18:50:19.733568\nMEAN_MOTION = 10.82419157\nECCENTRICITY = .1859667\nINCLINATION = 34.2682\nRA_OF_ASC_NODE = 348.7242\nARG_OF_PERICENTER = 331.7664\nMEAN_ANOMALY = 19.3264\nNORAD_CAT_ID = 5\nBSTAR = .28098E-4\nMEAN_MOTION_DOT = .23E-6\nMEAN_MOTION_DDOT = 0\n';
const KEYS = [
  'OBJECT_NAME',
  'OBJECT_ID',
  'EPOCH',
  'MEAN_MOTION',
  'ECCENTRICITY',
  'INCLINATION',
  'RA_OF_ASC_NODE',
  'ARG_OF_PERICENTER',
  'MEAN_ANOMALY',
  'NORAD_CAT_ID',
  'ELEMENT_SET_NO',
  'REV_AT_EPOCH',
  'BSTAR',
  'MEAN_MOTION_DOT',
  'MEAN_MOTION_DDOT',
  'CLASSIFICATION_TYPE',
  'EPHEMERIS_TYPE',
];
const NUMERIC: (keyof ElementSet)[] = [
  'catalogNumberInt',
  'epochMs',
  'meanMotionRevPerDay',
  'meanMotionDotRevPerDay2',
  'meanMotionDdotRevPerDay3',
  'bstar',
  'inclinationDeg',
  'raanDeg',
  'eccentricity',
  'argPerigeeDeg',
  'meanAnomalyDeg',
  'ephemerisType',
  'elementSetNo',
  'revAtEpoch',
];

/** Every problem found, as text (one expect per input keeps huge inputs fast). */
function problems(out: { records: ElementSet[]; errors: ParseError[] }): string[] {
  const found: string[] = [];
  for (const r of out.records) {
    for (const k of NUMERIC) if (!Number.isFinite(r[k])) found.push(`record at line ${r.sourceLine}: ${k} = ${String(r[k])}`);
    if (!(r.eccentricity >= 0 && r.eccentricity < 1)) found.push(`eccentricity ${r.eccentricity}`);
    if (!(r.meanMotionRevPerDay > 0)) found.push(`mean motion ${r.meanMotionRevPerDay}`);
    if (r.line1.length !== 69 || r.line2.length !== 69) found.push(`line lengths ${r.line1.length}/${r.line2.length}`);
    if (!/^\d{4}-\d\d-\d\dT/.test(r.epoch)) found.push(`epoch ${r.epoch}`);
  }
  for (const e of out.errors) {
    if (!(Number.isInteger(e.line) && e.line >= 1)) found.push(`error line ${e.line}`);
    if (typeof e.message !== 'string' || e.message === '') found.push('error without a message');
    if (e.columns && !(e.columns[0] >= 1 && e.columns[0] <= e.columns[1])) found.push(`columns ${e.columns.join('-')}`);
  }
  return found;
}

function checkOutput(out: { records: ElementSet[]; errors: ParseError[] }) {
  expect(problems(out)).toEqual([]);
}

const PARSERS: Array<[string, (t: string) => { records: ElementSet[]; errors: ParseError[] }]> = [
  ['auto', (t) => parseElementSets(t)],
  ['tle', (t) => parseTleText(t)],
  ['kvn', parseOmmKvn],
  ['xml', parseOmmXml],
  ['json', parseOmmJson],
  ['csv', parseOmmCsv],
];

function run(text: string) {
  for (const [, parse] of PARSERS) {
    let out: ReturnType<typeof parse> | undefined;
    expect(() => {
      out = parse(text);
    }).not.toThrow();
    checkOutput(out!);
  }
}

/** Line mutations: truncate, swap neighbours, replace a column, drop, duplicate. */
const mutatedLines = (base: string) =>
  fc
    .tuple(
      fc.array(fc.tuple(fc.nat(), fc.nat(80), fc.constantFrom('trunc', 'swap', 'char', 'drop', 'dup', 'nan', 'inf', 'big')), {
        maxLength: 6,
      }),
      fc.string({ maxLength: 3 }),
      fc.boolean(),
    )
    .map(([ops, junk, crlf]) => {
      const lines = base.split('\n');
      for (const [li, col, op] of ops) {
        if (lines.length === 0) break;
        const i = li % lines.length;
        const l = lines[i]!;
        switch (op) {
          case 'trunc':
            lines[i] = l.slice(0, col);
            break;
          case 'swap':
            if (i + 1 < lines.length) [lines[i], lines[i + 1]] = [lines[i + 1]!, l];
            break;
          case 'char':
            lines[i] = l.slice(0, col) + (junk || '#') + l.slice(col + 1);
            break;
          case 'drop':
            lines.splice(i, 1);
            break;
          case 'dup':
            lines.splice(i, 0, l);
            break;
          case 'nan':
            lines[i] = l.slice(0, col) + 'NaN' + l.slice(col + 3);
            break;
          case 'inf':
            lines[i] = l.slice(0, col) + 'Infinity' + l.slice(col + 8);
            break;
          case 'big':
            lines[i] = l.slice(0, col) + '9e999' + l.slice(col + 5);
            break;
        }
      }
      return lines.join(crlf ? '\r\n' : '\n');
    });

describe('fuzzing every parser', () => {
  it('random text and random bytes', () => {
    fc.assert(
      fc.property(
        fc.oneof(
          fc.string({ maxLength: 400 }),
          fc.string({ unit: 'binary', maxLength: 400 }),
          fc.uint8Array({ maxLength: 400 }).map((b) => new TextDecoder('utf-8').decode(b)),
        ),
        (t) => run(t),
      ),
      { numRuns: 400 },
    );
  });

  it('TLE files with truncated, swapped, dropped, duplicated lines, stray characters, NaN and Infinity', () => {
    fc.assert(
      fc.property(mutatedLines(GOOD_TLE), (t) => run(t)),
      { numRuns: 600 },
    );
  });

  it('TLE lines with wrong checksums are rejected with a checksum error, never kept', () => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 9 }), fc.boolean(), (delta, second) => {
        const line = second ? L2 : L1;
        const bad = line.slice(0, 68) + String((Number(line[68]) + delta) % 10);
        const r = parseElementSets(second ? `${L1}\n${bad}` : `${bad}\n${L2}`);
        expect(r.records).toHaveLength(0);
        expect(r.errors[0]).toMatchObject({ line: second ? 2 : 1, columns: [69, 69], field: 'checksum' });
      }),
    );
  });

  it('single-field replacement in TLE columns with digits keeps every record finite and in range', () => {
    fc.assert(
      fc.property(fc.boolean(), fc.integer({ min: 2, max: 67 }), fc.stringMatching(/^[0-9 .+-]{1,11}$/), (second, col, text) => {
        const base = second ? L2 : L1;
        const body = (base.slice(0, col) + text + base.slice(col + text.length)).slice(0, 68);
        let sum = 0;
        for (const ch of body) sum += ch === '-' ? 1 : ch >= '0' && ch <= '9' ? Number(ch) : 0;
        const line = body + (sum % 10);
        run(second ? `${L1}\n${line}` : `${line}\n${L2}`);
      }),
      { numRuns: 1000 },
    );
  });

  it('OMM KVN with mutated lines and out-of-range or non-numeric values', () => {
    fc.assert(
      fc.property(mutatedLines(KVN), (t) => run(t)),
      { numRuns: 300 },
    );
    fc.assert(
      fc.property(
        fc.constantFrom(...KEYS),
        fc.oneof(fc.constantFrom('NaN', 'Infinity', '-1', '1e999', '', '0x10', '1,5', '2000-13-45T00:00:00'), fc.string({ maxLength: 12 })),
        (k, v) => {
          run(KVN.replace(new RegExp(`^${k} = .*$`, 'm'), `${k} = ${v}`));
        },
      ),
      { numRuns: 300 },
    );
  });

  it('OMM JSON with arbitrary values under the keywords', () => {
    const value = fc.oneof(
      fc.double(),
      fc.string({ maxLength: 10 }),
      fc.constant(null),
      fc.boolean(),
      fc.integer(),
      fc.anything({ maxDepth: 1 }),
    );
    fc.assert(
      fc.property(fc.array(fc.dictionary(fc.constantFrom(...KEYS), value, { maxKeys: 17 }), { maxLength: 5 }), (objs) => {
        run(JSON.stringify(objs));
      }),
      { numRuns: 300 },
    );
  });

  it('OMM XML and CSV, mutated', () => {
    const xml = `<omm><body><segment><metadata><OBJECT_NAME>X</OBJECT_NAME></metadata><data><meanElements>${KEYS.slice(2, 9)
      .map((k) => `<${k}>${/EPOCH/.test(k) ? '2000-06-27T18:50:19' : '1.5'}</${k}>`)
      .join('')}</meanElements><tleParameters><NORAD_CAT_ID>5</NORAD_CAT_ID></tleParameters></data></segment></body></omm>`;
    expect(parseOmmXml(xml).records).toHaveLength(0); // ECCENTRICITY 1.5 is out of range
    fc.assert(
      fc.property(fc.nat(xml.length), fc.string({ maxLength: 6 }), (at, junk) => run(xml.slice(0, at) + junk + xml.slice(at + 1))),
      { numRuns: 300 },
    );
    const csv = `${KEYS.join(',')}\nX,1958-002B,2000-06-27T18:50:19,10.8,.18,34.2,348.7,331.7,19.3,5,1,1,.28E-4,0,0,U,0\n`;
    expect(parseOmmCsv(csv).records).toHaveLength(1);
    fc.assert(
      fc.property(mutatedLines(csv), fc.nat(200), fc.string({ maxLength: 5 }), (t, at, junk) => run(t.slice(0, at) + junk + t.slice(at))),
      { numRuns: 300 },
    );
  });

  it('huge inputs: 40 000 sets with 1 % corrupted lines, and 5 MB of noise, finish and stay finite', () => {
    const sets = Array.from(
      { length: 20_000 },
      (_, i) => parseElementSets(`${L1}\n${L2}`).records.map((s) => ({ ...s, elementSetNo: i % 10_000 }))[0]!,
    );
    const lines = formatTleFile([...sets, ...sets]).split('\n');
    for (let i = 0; i < lines.length; i += 100) lines[i] = lines[i]!.slice(0, 40);
    const t0 = performance.now();
    const r = parseElementSets(lines.join('\n'));
    expect(performance.now() - t0).toBeLessThan(5000);
    checkOutput(r);
    expect(r.records.length).toBeGreaterThan(38_000);
    expect(r.errors.length).toBeGreaterThan(0);
    const noise = 'x1 2 <a>{"'.repeat(500_000);
    for (const [, parse] of PARSERS) checkOutput(parse(noise));
  });
});
