// Writes element sets as CCSDS Orbit Mean-Elements Messages (CCSDS 502.0-B-2): XML (an <ndm> of <omm>s), JSON and
// CSV in the form public catalogs publish (keyword names as keys / header row). TLE-based: MEAN_ELEMENT_THEORY SGP4,
// MEAN_MOTION in rev/day, TEME, UTC. Our own parsers read every form back (tests/orbit/omm-write.test.ts).
import { XMLBuilder } from 'fast-xml-parser';
import Papa from 'papaparse';
import { formatCatalogNumber, parseCatalogNumber } from './catalog-number';
import type { TleWriteInput } from './tle-write';

export type OmmWriteInput = TleWriteInput & { name?: string };

/** "25961A" → "2025-961A" (two-digit years 57–99 are 1957–1999, 00–56 are 2000–2056, as in a TLE). */
export function designatorToObjectId(designator: string): string {
  const m = /^(\d{2})(\d{3})([A-Z]{1,3})$/.exec(designator.trim());
  if (!m) return 'UNKNOWN';
  const yy = Number(m[1]);
  return `${yy >= 57 ? 1900 + yy : 2000 + yy}-${m[2]}${m[3]}`;
}

/** CCSDS time with microseconds, UTC, no zone letter: "2026-11-23T21:19:34.149123". */
export function ccsdsTime(epochMs: number): string {
  const wholeMs = Math.floor(epochMs);
  const micro = Math.round((epochMs - wholeMs) * 1000);
  const carry = micro === 1000 ? 1 : 0;
  const iso = new Date(wholeMs + carry).toISOString(); // 2026-11-23T21:19:34.149Z
  return `${iso.slice(0, 23)}${String(carry ? 0 : micro).padStart(3, '0')}`;
}

const META = { CENTER_NAME: 'EARTH', REF_FRAME: 'TEME', TIME_SYSTEM: 'UTC', MEAN_ELEMENT_THEORY: 'SGP4' } as const;

/** One set's keywords in the standard's order: metadata, mean elements, TLE parameters. */
export function ommKeywords(set: OmmWriteInput) {
  const catalogNumberInt = set.catalogNumberInt ?? parseCatalogNumber(set.catalogNumber) ?? 0;
  return {
    metadata: {
      OBJECT_NAME: set.name ?? formatCatalogNumber(catalogNumberInt),
      OBJECT_ID: designatorToObjectId(set.internationalDesignator),
      ...META,
    },
    meanElements: {
      EPOCH: ccsdsTime(set.epochMs),
      MEAN_MOTION: set.meanMotionRevPerDay,
      ECCENTRICITY: set.eccentricity,
      INCLINATION: set.inclinationDeg,
      RA_OF_ASC_NODE: set.raanDeg,
      ARG_OF_PERICENTER: set.argPerigeeDeg,
      MEAN_ANOMALY: set.meanAnomalyDeg,
    },
    tleParameters: {
      EPHEMERIS_TYPE: set.ephemerisType ?? 0,
      CLASSIFICATION_TYPE: set.classification,
      NORAD_CAT_ID: catalogNumberInt,
      ELEMENT_SET_NO: set.elementSetNo,
      REV_AT_EPOCH: set.revAtEpoch,
      BSTAR: set.bstar,
      MEAN_MOTION_DOT: set.meanMotionDotRevPerDay2,
      MEAN_MOTION_DDOT: set.meanMotionDdotRevPerDay3,
    },
  };
}

/** Flat keyword → value objects, one per set (the JSON form; CSV uses the same keys as its header). */
export function ommRecords(sets: readonly OmmWriteInput[]) {
  return sets.map((s) => {
    const k = ommKeywords(s);
    return { CCSDS_OMM_VERS: '2.0', ...k.metadata, ...k.meanElements, ...k.tleParameters };
  });
}

export function formatOmmJson(sets: readonly OmmWriteInput[]): string {
  return JSON.stringify(ommRecords(sets), null, 1);
}

/**
 * CSV with the keywords as the header row. Values are numbers, designators and the object's name; a name that a
 * spreadsheet would read as a formula (= + - @, tab, CR first) gets a leading apostrophe.
 */
export function formatOmmCsv(sets: readonly OmmWriteInput[]): string {
  const rows = ommRecords(sets).map((r) => ({
    ...r,
    OBJECT_NAME: /^[=+\-@\t\r]/.test(r.OBJECT_NAME) ? `'${r.OBJECT_NAME}` : r.OBJECT_NAME,
  }));
  return Papa.unparse(rows, { newline: '\n' }) + '\n';
}

export function formatOmmXml(sets: readonly OmmWriteInput[], opts: { creationMs: number; originator: string }): string {
  const builder = new XMLBuilder({ ignoreAttributes: false, attributeNamePrefix: '@_', format: true, indentBy: ' ' });
  const omm = sets.map((s) => {
    const k = ommKeywords(s);
    return {
      '@_id': 'CCSDS_OMM_VERS',
      '@_version': '2.0',
      header: { CREATION_DATE: ccsdsTime(opts.creationMs), ORIGINATOR: opts.originator },
      body: { segment: { metadata: k.metadata, data: { meanElements: k.meanElements, tleParameters: k.tleParameters } } },
    };
  });
  return `<?xml version="1.0" encoding="UTF-8"?>\n${builder.build({ ndm: { omm } })}`;
}
