// CCSDS OMM (502.0-B-2) in KVN, XML, JSON and CSV, checked against the same set as a TLE. Convention pinned
// here: MEAN_MOTION_DOT is the TLE line-1 field ṅ/2 and MEAN_MOTION_DDOT the field n̈/6 (REFERENCES.md §3).
import { describe, expect, it } from 'vitest';
import { detectFormat, parseElementSets, parseOmmXml, type ElementSet } from '../../shared/orbit';

const TLE = `00005 TEST\n1 00005U 58002B   00179.78495062  .00000023  00000-0  28098-4 0  4753\n2 00005  34.2682 348.7242 1859667 331.7664  19.3264 10.82419157413667\n`;

const KVN = `CCSDS_OMM_VERS = 2.0
COMMENT made for the test
CREATION_DATE = 2000-06-28T00:00:00
ORIGINATOR = TEST
OBJECT_NAME = 00005 TEST
OBJECT_ID = 1958-002B
CENTER_NAME = EARTH
REF_FRAME = TEME
TIME_SYSTEM = UTC
MEAN_ELEMENT_THEORY = SGP4
EPOCH = 2000-06-27T18:50:19.733568
MEAN_MOTION = 10.82419157 [rev/day]
ECCENTRICITY = .1859667
INCLINATION = 34.2682 [deg]
RA_OF_ASC_NODE = 348.7242 [deg]
ARG_OF_PERICENTER = 331.7664 [deg]
MEAN_ANOMALY = 19.3264 [deg]
EPHEMERIS_TYPE = 0
CLASSIFICATION_TYPE = U
NORAD_CAT_ID = 5
ELEMENT_SET_NO = 475
REV_AT_EPOCH = 41366
BSTAR = .28098E-4
MEAN_MOTION_DOT = .23E-6
MEAN_MOTION_DDOT = 0
`;

const XML = `<?xml version="1.0" encoding="UTF-8"?>
<ndm xmlns:xsi="http://www.w3.org/2001/XMLSchema-instance">
  <omm id="CCSDS_OMM_VERS" version="2.0">
    <header><CREATION_DATE>2000-06-28T00:00:00</CREATION_DATE><ORIGINATOR>TEST</ORIGINATOR></header>
    <body>
      <segment>
        <metadata>
          <OBJECT_NAME>00005 TEST</OBJECT_NAME><OBJECT_ID>1958-002B</OBJECT_ID><CENTER_NAME>EARTH</CENTER_NAME>
          <REF_FRAME>TEME</REF_FRAME><TIME_SYSTEM>UTC</TIME_SYSTEM><MEAN_ELEMENT_THEORY>SGP4</MEAN_ELEMENT_THEORY>
        </metadata>
        <data>
          <meanElements>
            <EPOCH>2000-06-27T18:50:19.733568</EPOCH><MEAN_MOTION units="rev/day">10.82419157</MEAN_MOTION>
            <ECCENTRICITY>.1859667</ECCENTRICITY><INCLINATION units="deg">34.2682</INCLINATION>
            <RA_OF_ASC_NODE>348.7242</RA_OF_ASC_NODE><ARG_OF_PERICENTER>331.7664</ARG_OF_PERICENTER>
            <MEAN_ANOMALY>19.3264</MEAN_ANOMALY>
          </meanElements>
          <tleParameters>
            <EPHEMERIS_TYPE>0</EPHEMERIS_TYPE><CLASSIFICATION_TYPE>U</CLASSIFICATION_TYPE><NORAD_CAT_ID>5</NORAD_CAT_ID>
            <ELEMENT_SET_NO>475</ELEMENT_SET_NO><REV_AT_EPOCH>41366</REV_AT_EPOCH><BSTAR>.28098E-4</BSTAR>
            <MEAN_MOTION_DOT>.23E-6</MEAN_MOTION_DOT><MEAN_MOTION_DDOT>0</MEAN_MOTION_DDOT>
          </tleParameters>
        </data>
      </segment>
    </body>
  </omm>
</ndm>
`;

const JSON_TEXT = JSON.stringify(
  [
    {
      OBJECT_NAME: '00005 TEST',
      OBJECT_ID: '1958-002B',
      EPOCH: '2000-06-27T18:50:19.733568',
      MEAN_MOTION: 10.82419157,
      ECCENTRICITY: 0.1859667,
      INCLINATION: 34.2682,
      RA_OF_ASC_NODE: 348.7242,
      ARG_OF_PERICENTER: 331.7664,
      MEAN_ANOMALY: 19.3264,
      EPHEMERIS_TYPE: 0,
      CLASSIFICATION_TYPE: 'U',
      NORAD_CAT_ID: 5,
      ELEMENT_SET_NO: 475,
      REV_AT_EPOCH: 41366,
      BSTAR: 0.000028098,
      MEAN_MOTION_DOT: 2.3e-7,
      MEAN_MOTION_DDOT: 0,
    },
  ],
  null,
  2,
);

const CSV = `OBJECT_NAME,OBJECT_ID,EPOCH,MEAN_MOTION,ECCENTRICITY,INCLINATION,RA_OF_ASC_NODE,ARG_OF_PERICENTER,MEAN_ANOMALY,EPHEMERIS_TYPE,CLASSIFICATION_TYPE,NORAD_CAT_ID,ELEMENT_SET_NO,REV_AT_EPOCH,BSTAR,MEAN_MOTION_DOT,MEAN_MOTION_DDOT
00005 TEST,1958-002B,2000-06-27T18:50:19.733568,10.82419157,.1859667,34.2682,348.7242,331.7664,19.3264,0,U,5,475,41366,.28098E-4,.23E-6,0
`;

const NUMERIC: (keyof ElementSet)[] = [
  'catalogNumberInt',
  'meanMotionRevPerDay',
  'meanMotionDotRevPerDay2',
  'meanMotionDdotRevPerDay3',
  'bstar',
  'inclinationDeg',
  'raanDeg',
  'eccentricity',
  'argPerigeeDeg',
  'meanAnomalyDeg',
  'elementSetNo',
  'revAtEpoch',
];

describe('OMM parsers agree with the same set as a TLE', () => {
  const tle = parseElementSets(TLE).records[0]!;
  const inputs: Array<[string, string]> = [
    ['omm-kvn', KVN],
    ['omm-xml', XML],
    ['omm-json', JSON_TEXT],
    ['omm-csv', CSV],
  ];
  for (const [format, text] of inputs) {
    it(`${format}: detected from content, same elements, epoch within 0.01 ms, identical synthesized TLE lines`, () => {
      expect(detectFormat(text)).toBe(format);
      const r = parseElementSets(text);
      expect(r.format).toBe(format);
      expect(r.errors).toEqual([]);
      expect(r.records).toHaveLength(1);
      const omm = r.records[0]!;
      for (const k of NUMERIC) expect(omm[k] as number).toBeCloseTo(tle[k] as number, 12);
      expect(Math.abs(omm.epochMs - tle.epochMs)).toBeLessThan(0.01);
      expect(omm.catalogNumber).toBe('00005');
      expect(omm.internationalDesignator).toBe('58002B');
      expect(omm.name).toBe('00005 TEST');
      expect(omm.line1).toBe(tle.line1);
      expect(omm.line2).toBe(tle.line2);
    });
  }
  it('detects TLE text too, with or without a name line', () => {
    expect(detectFormat(TLE)).toBe('tle');
    expect(detectFormat(TLE.split('\n').slice(1).join('\n'))).toBe('tle');
    expect(detectFormat('hello\nworld')).toBe('unknown');
  });
});

describe('OMM errors name the line and the keyword', () => {
  it('KVN: the line of a bad value, what was wrong and what was expected', () => {
    const bad = KVN.replace('ECCENTRICITY = .1859667', 'ECCENTRICITY = 1.2');
    const r = parseElementSets(bad);
    expect(r.records).toHaveLength(0);
    expect(r.errors).toEqual([expect.objectContaining({ line: 13, field: 'ECCENTRICITY', expected: '0 ≤ ECCENTRICITY < 1' })]);
  });
  it('KVN: two messages in one file, the second missing MEAN_MOTION', () => {
    const second = KVN.replace('MEAN_MOTION = 10.82419157 [rev/day]\n', '').replace('ELEMENT_SET_NO = 475', 'ELEMENT_SET_NO = 476');
    const r = parseElementSets(KVN + second);
    expect(r.records).toHaveLength(1);
    expect(r.errors).toHaveLength(1);
    expect(r.errors[0]).toMatchObject({ field: 'MEAN_MOTION', line: 26 });
  });
  it('KVN: a line over 254 characters is refused', () => {
    const r = parseElementSets(KVN + `COMMENT ${'x'.repeat(300)}\n`);
    expect(r.errors[0]).toMatchObject({ line: 26, expected: 'at most 254 characters (KVN)' });
  });
  it("XML: malformed XML gives the validator's line", () => {
    const r = parseElementSets(XML.replace('</ECCENTRICITY>', '</ECCENTRICITYX>'));
    expect(r.records).toHaveLength(0);
    const expectedLine = XML.split('\n').findIndex((l) => l.includes('</ECCENTRICITY>')) + 1;
    expect(r.errors[0]!.line).toBe(expectedLine);
    expect(r.errors[0]!.message).toMatch(/^XML:/);
  });
  it('XML: a bare <omm> root also parses', () => {
    const bare = XML.replace(/<ndm[^>]*>/, '').replace('</ndm>', '');
    expect(parseElementSets(bare).records).toHaveLength(1);
  });
  it('JSON: each bad object is reported at its own line; the good ones are kept', () => {
    const list = [
      JSON.parse(JSON_TEXT)[0],
      { ...JSON.parse(JSON_TEXT)[0], INCLINATION: 200 },
      { ...JSON.parse(JSON_TEXT)[0], EPOCH: 'yesterday' },
    ];
    const text = JSON.stringify(list, null, 2);
    const r = parseElementSets(text);
    expect(r.records).toHaveLength(1);
    expect(r.errors.map((e) => e.field)).toEqual(['INCLINATION', 'EPOCH']);
    const lines = text.split('\n');
    expect(lines[r.errors[0]!.line - 1]!.trim()).toBe('{');
    expect(r.errors[1]!.line).toBeGreaterThan(r.errors[0]!.line);
  });
  it('JSON: a syntax error is one error with its line', () => {
    const r = parseElementSets('[\n{"EPOCH": 1,\n}\n]');
    expect(r.records).toHaveLength(0);
    expect(r.errors).toHaveLength(1);
    expect(r.errors[0]!.line).toBe(3);
  });
  it('CSV: a bad row names its line; a row with the wrong number of cells too', () => {
    const rows = CSV.trimEnd().split('\n');
    const text = [rows[0], rows[1], rows[1]!.replace(',10.82419157,', ',-3,'), 'a,b'].join('\n');
    const r = parseElementSets(text);
    expect(r.records).toHaveLength(1);
    expect(r.errors).toEqual([
      expect.objectContaining({ line: 3, field: 'MEAN_MOTION' }),
      expect.objectContaining({ line: 4, expected: '17 cells' }),
    ]);
  });
  it('refuses OMM of a non-SGP4 mean element theory', () => {
    const r = parseElementSets(KVN.replace('MEAN_ELEMENT_THEORY = SGP4', 'MEAN_ELEMENT_THEORY = DSST'));
    expect(r.errors[0]).toMatchObject({ field: 'MEAN_ELEMENT_THEORY', line: 10 });
  });
  it('accepts day-of-year CCSDS epochs (YYYY-DDDThh:mm:ss)', () => {
    const r = parseElementSets(KVN.replace('EPOCH = 2000-06-27T18:50:19.733568', 'EPOCH = 2000-179T18:50:19.733568'));
    expect(r.errors).toEqual([]);
    expect(r.records[0]!.epoch).toBe('2000-06-27T18:50:19.734Z');
  });
});

describe('a broken XML file: what is wrong, where, in words', () => {
  const lineOf = (needle: string) => XML.split('\n').findIndex((l) => l.includes(needle)) + 1;
  const colOf = (needle: string) => XML.split('\n')[lineOf(needle) - 1]!.indexOf(needle) + 1;
  it('a mistyped closing tag names both elements, the line and column, and where the element opened', () => {
    const r = parseElementSets(XML.replace('</ECCENTRICITY>', '</ECCENTRICITYX>'));
    const line = lineOf('</ECCENTRICITY>');
    expect(r.errors).toHaveLength(1);
    expect(r.errors[0]).toMatchObject({
      line,
      columns: [colOf('</ECCENTRICITY>'), colOf('</ECCENTRICITY>')],
      field: 'ECCENTRICITY',
      message: `XML: line ${line}, column ${colOf('</ECCENTRICITY>')}: </ECCENTRICITYX> where </ECCENTRICITY> was expected (<ECCENTRICITY> opened on line ${line}, column ${colOf('<ECCENTRICITY>')})`,
      expected: '</ECCENTRICITY>',
    });
  });
  it('an element never closed', () => {
    const r = parseElementSets(XML.replace('</ndm>', ''));
    expect(r.errors[0]).toMatchObject({ line: 2, field: 'ndm', expected: '</ndm> before the end of the file' });
    expect(r.errors[0]!.message).toBe('XML: line 2, column 1: <ndm> is opened here but never closed');
  });
  it('a bare "&" in a value', () => {
    const r = parseElementSets(XML.replace('<ORIGINATOR>TEST</ORIGINATOR>', '<ORIGINATOR>A & B</ORIGINATOR>'));
    expect(r.errors[0]).toMatchObject({ line: 4, expected: '"&amp;" for a literal "&"' });
    expect(r.errors[0]!.message).toMatch(/^XML: line 4, column \d+: an "&" that starts no entity$/);
  });
  it('a closing tag with no opening one names the element that is open there', () => {
    const r = parseElementSets(XML.replace('<MEAN_ANOMALY>19.3264</MEAN_ANOMALY>', '19.3264</MEAN_ANOMALY>'));
    const line = lineOf('<MEAN_ANOMALY>');
    const opened = lineOf('<meanElements>');
    expect(r.errors[0]).toMatchObject({ line, field: 'meanElements', expected: '</meanElements>' });
    expect(r.errors[0]!.message).toMatch(
      new RegExp(
        `^XML: line ${line}, column \\d+: </MEAN_ANOMALY> where </meanElements> was expected \\(<meanElements> opened on line ${opened}, column 11\\)$`,
      ),
    );
  });
  it('a closing tag before any element is open', () => {
    const r = parseOmmXml('</omm>\n');
    expect(r.errors).toEqual([
      {
        line: 1,
        columns: [1, 1],
        field: 'omm',
        message: 'XML: line 1, column 1: </omm> closes an element that is not open',
        expected: 'an opening <omm> before it, or no </omm>',
      },
    ]);
  });
});
