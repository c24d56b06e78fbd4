// The demo's identifiers are fictional by construction, so no screen or error points at a real object.
import { describe, expect, it } from 'vitest';
import { FICTIONAL_CATALOG_NUMBERS, TERN1, simulateTern1 } from '../../shared/orbit/simulate';
import { writeTle } from '../../shared/orbit/tle-write';
import { parseOmmKvn } from '../../shared/orbit/omm-parse';

describe('fictional identifiers', () => {
  it('gives Tern-1 a designator whose launch number no year has reached, and a catalog number in the fictional range', () => {
    // TLE line 1 columns 10–17: YY, launch number of the year (3 digits), piece (REFERENCES.md §2).
    const m = /^(\d{2})(\d{3})([A-Z]{1,3})$/.exec(TERN1.internationalDesignator)!;
    expect(m).not.toBeNull();
    // A few hundred orbital launches a year at most so far (common practice, from memory): 900+ is unused.
    expect(Number(m[2])).toBeGreaterThanOrEqual(900);
    expect(TERN1.catalogNumberInt).toBeGreaterThanOrEqual(FICTIONAL_CATALOG_NUMBERS.min);
    expect(TERN1.catalogNumberInt).toBeLessThanOrEqual(FICTIONAL_CATALOG_NUMBERS.max);
    const line1 = writeTle(simulateTern1({ days: 1 }).sets[0]!).line1;
    expect(line1.slice(9, 17).trim()).toBe('25951C');
  });

  it('shows our own designator as the example when an OMM OBJECT_ID is malformed', () => {
    const { errors } = parseOmmKvn(
      'CCSDS_OMM_VERS = 2.0\nOBJECT_NAME = X\nOBJECT_ID = launch-seven\nEPOCH = 2026-04-10T12:00:00\nMEAN_MOTION = 14.3\nECCENTRICITY = .0002\nINCLINATION = 98.5\nRA_OF_ASC_NODE = 140\nARG_OF_PERICENTER = 89\nMEAN_ANOMALY = 271\nNORAD_CAT_ID = 99871\nBSTAR = .002\nMEAN_MOTION_DOT = 0\nMEAN_MOTION_DDOT = 0\n',
    );
    const e = errors.find((x) => x.field === 'OBJECT_ID');
    expect(e?.expected).toBe('YYYY-NNNP such as 2025-951C');
  });
});
