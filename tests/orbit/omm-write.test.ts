// Open data: the OMM writer (CCSDS 502.0-B-2 XML, and the JSON/CSV forms public catalogs use) read back by our
// parsers gives the same two-line sets. Inputs: published SGP4-VER.TLE cases (Vallado et al., AIAA 2006-6753)
// and simulated Tern-1 sets, each first parsed from TLE text so every value is what a TLE can hold.
import { describe, expect, it } from 'vitest';
import { formatTleFile, parseElementSets, writeTle, type ElementSet } from '../../shared/orbit';
import { ccsdsTime, designatorToObjectId, formatOmmCsv, formatOmmJson, formatOmmXml } from '../../shared/orbit/omm-write';
import { simulateTern1 } from '../../shared/orbit/simulate';
import { readVerificationCases } from '../reference/reference-data';

function published(): ElementSet[] {
  const text = readVerificationCases()
    .filter((c) => !['33333', '33334', '33335'].includes(c.catalogNumber)) // built to fail
    .map((c) => `${c.line1}\n${c.line2}`)
    .join('\n');
  return parseElementSets(text).records;
}

function simulated(): ElementSet[] {
  return parseElementSets(formatTleFile(simulateTern1({ days: 30 }).sets, { withNames: true })).records;
}

// Compared as our writer's canonical lines: a published line may write a zero exponent as "+0" or leave the
// ephemeris type blank, which carry the same values.
const lines = (sets: ElementSet[]) => sets.map((s) => Object.values(writeTle(s)));

describe('OMM writer', () => {
  const sets = [...published(), ...simulated()];

  it('has sets to write', () => {
    expect(sets.length).toBeGreaterThan(50);
  });

  for (const [form, text] of [
    ['XML', () => formatOmmXml(sets, { creationMs: Date.UTC(2026, 11, 2), originator: 'LIGHTKEEL' })],
    ['JSON', () => formatOmmJson(sets)],
    ['CSV', () => formatOmmCsv(sets)],
  ] as const) {
    it(`writes ${form} that our parser reads back to the same two-line sets`, () => {
      const back = parseElementSets(text());
      expect(back.errors).toEqual([]);
      expect(lines(back.records)).toEqual(lines(sets));
    });
  }

  it('writes the XML structure of CCSDS 502.0-B-2 (ndm/omm/header/body/segment/metadata/data)', () => {
    const xml = formatOmmXml(sets.slice(0, 1), { creationMs: Date.UTC(2026, 11, 2), originator: 'LIGHTKEEL' });
    expect(xml).toMatch(/<ndm>\s*<omm id="CCSDS_OMM_VERS" version="2.0">\s*<header>/);
    expect(xml).toContain('<MEAN_ELEMENT_THEORY>SGP4</MEAN_ELEMENT_THEORY>');
    expect(xml).toContain('<REF_FRAME>TEME</REF_FRAME>');
    expect(xml).toMatch(/<data>\s*<meanElements>\s*<EPOCH>/);
    expect(xml).toContain('<tleParameters>');
  });

  it('turns TLE designators into OBJECT_IDs with the TLE year rule (57–99 → 19xx)', () => {
    expect(designatorToObjectId('58002B')).toBe('1958-002B');
    expect(designatorToObjectId('06040A')).toBe('2006-040A');
    expect(designatorToObjectId('')).toBe('UNKNOWN');
  });

  it('writes CCSDS times with microseconds and no zone letter', () => {
    expect(ccsdsTime(Date.UTC(2026, 10, 23, 21, 19, 34, 149) + 0.1234)).toBe('2026-11-23T21:19:34.149123');
    expect(ccsdsTime(Date.UTC(2026, 0, 1) + 0.9996)).toBe('2026-01-01T00:00:00.001000');
  });

  it('keeps a formula-looking object name from running in a spreadsheet', () => {
    const csv = formatOmmCsv([{ ...sets[0]!, name: '=HYPERLINK("x")' }]);
    expect(csv).toContain(`"'=HYPERLINK(""x"")"`);
  });
});
