// Turns one OMM's keyword → value map (CCSDS 502.0-B-2 keyword names) into an ElementSet, naming each bad field.
import { formatCatalogNumber, MAX_CATALOG_NUMBER } from './catalog-number';
import { msToIso, parseCcsdsTime } from './epoch';
import { MAX_MEAN_MOTION_REV_PER_DAY } from './tle-parse';
import { writeTle } from './tle-write';
import type { Classification, ElementSet, ParseError } from './types';

export type OmmValue = string | number | boolean | null | undefined;
export type OmmFields = Record<string, OmmValue>;

const SGP4_THEORIES = new Set(['SGP4', 'SGP', 'SDP4', 'SGP/SGP4', 'SGP4/SDP4']);

/** "2025-951C" → "25951C" (the TLE form); a value already in TLE form is kept. */
export function objectIdToDesignator(objectId: string): string | null {
  const s = objectId.trim().toUpperCase();
  if (s === '' || s === 'UNKNOWN') return '';
  const m = /^(\d{4})-(\d{3})([A-Z]{1,3})$/.exec(s);
  if (m) return m[1]!.slice(2) + m[2]! + m[3]!;
  if (/^\d{5}[A-Z]{1,3}$/.test(s)) return s;
  return null;
}

function asText(v: OmmValue): string | undefined {
  if (v === undefined || v === null) return undefined;
  const s = String(v).trim();
  return s === '' ? undefined : s;
}

function asNumber(v: OmmValue): number {
  if (typeof v === 'number') return v;
  const s = asText(v);
  if (s === undefined) return NaN;
  // Number() accepts "0x10", "Infinity" and "1_0"-free forms; keep to plain decimals.
  if (!/^[+-]?(\d+\.?\d*|\.\d+)([eEdD][+-]?\d+)?$/.test(s)) return NaN;
  return Number(s.replace(/[dD]/, 'e'));
}

/**
 * @param fieldLine line of a keyword when known (KVN), else the record's line.
 */
export function ommFieldsToElementSet(
  fields: OmmFields,
  recordLine: number,
  fieldLine: (key: string) => number = () => recordLine,
): { record: ElementSet | null; errors: ParseError[] } {
  const errors: ParseError[] = [];
  const err = (field: string, message: string, expected: string) => errors.push({ line: fieldLine(field), field, message, expected });

  const checked = (key: string, raw: OmmValue, expected: string, ok: (v: number) => boolean): number => {
    const v = asNumber(raw);
    if (!Number.isFinite(v)) err(key, `${key} "${String(raw)}" is not a number`, expected);
    else if (!ok(v)) err(key, `${key} ${v} is out of range`, expected);
    return v;
  };
  const required = (key: string, expected: string, ok: (v: number) => boolean): number => {
    const raw = fields[key];
    if (asText(raw) === undefined) {
      err(key, `${key} is missing`, expected);
      return NaN;
    }
    return checked(key, raw, expected, ok);
  };
  const optional = (key: string, fallback: number, expected: string, ok: (v: number) => boolean): number => {
    const raw = fields[key];
    return asText(raw) === undefined ? fallback : checked(key, raw, expected, ok);
  };

  const theory = asText(fields.MEAN_ELEMENT_THEORY)?.toUpperCase();
  if (theory !== undefined && !SGP4_THEORIES.has(theory)) {
    err('MEAN_ELEMENT_THEORY', `mean elements of theory "${theory}" cannot be propagated with SGP4`, 'SGP4 (a TLE-based OMM)');
  }
  const epochText = asText(fields.EPOCH);
  let epochMs = NaN;
  if (epochText === undefined) err('EPOCH', 'EPOCH is missing', 'a UTC time such as 2024-03-01T12:00:00.000');
  else {
    epochMs = parseCcsdsTime(epochText);
    const year = Number.isFinite(epochMs) ? new Date(epochMs).getUTCFullYear() : NaN;
    if (!Number.isFinite(epochMs))
      err('EPOCH', `EPOCH "${epochText}" is not a CCSDS time`, 'YYYY-MM-DDThh:mm:ss[.d…] or YYYY-DDDThh:mm:ss[.d…] (UTC)');
    else if (!(year >= 1957 && year <= 2056))
      err('EPOCH', `EPOCH year ${year} cannot be written in a two-line set`, 'a year from 1957 to 2056');
  }
  if (asText(fields.MEAN_MOTION) === undefined && asText(fields.SEMI_MAJOR_AXIS) !== undefined) {
    err('MEAN_MOTION', 'MEAN_MOTION is missing (SEMI_MAJOR_AXIS given)', 'MEAN_MOTION in rev/day, as a TLE-based OMM gives it');
  }
  const n = required(
    'MEAN_MOTION',
    `0 < MEAN_MOTION ≤ ${MAX_MEAN_MOTION_REV_PER_DAY} rev/day`,
    (v) => v > 0 && v <= MAX_MEAN_MOTION_REV_PER_DAY,
  );
  const e = required('ECCENTRICITY', '0 ≤ ECCENTRICITY < 1', (v) => v >= 0 && v < 1);
  const i = required('INCLINATION', '0 ≤ INCLINATION ≤ 180 deg', (v) => v >= 0 && v <= 180);
  const raan = required('RA_OF_ASC_NODE', '0 ≤ RA_OF_ASC_NODE ≤ 360 deg', (v) => v >= 0 && v <= 360);
  const argp = required('ARG_OF_PERICENTER', '0 ≤ ARG_OF_PERICENTER ≤ 360 deg', (v) => v >= 0 && v <= 360);
  const ma = required('MEAN_ANOMALY', '0 ≤ MEAN_ANOMALY ≤ 360 deg', (v) => v >= 0 && v <= 360);
  const cat = required('NORAD_CAT_ID', `integer 0…${MAX_CATALOG_NUMBER}`, (v) => Number.isInteger(v) && v >= 0 && v <= MAX_CATALOG_NUMBER);
  const bstar = optional('BSTAR', 0, '|BSTAR| < 10 per Earth radius', (v) => Math.abs(v) < 10);
  const ndot = optional('MEAN_MOTION_DOT', 0, '|MEAN_MOTION_DOT| < 1 rev/day² (the TLE field ṅ/2)', (v) => Math.abs(v) < 1);
  const nddot = optional('MEAN_MOTION_DDOT', 0, '|MEAN_MOTION_DDOT| < 1 rev/day³ (the TLE field n̈/6)', (v) => Math.abs(v) < 1);
  const elset = optional('ELEMENT_SET_NO', 0, 'integer 0…9999', (v) => Number.isInteger(v) && v >= 0 && v <= 9999);
  const rev = optional('REV_AT_EPOCH', 0, 'integer 0…99999', (v) => Number.isInteger(v) && v >= 0 && v <= 99_999);
  const eph = optional('EPHEMERIS_TYPE', 0, 'integer 0…9', (v) => Number.isInteger(v) && v >= 0 && v <= 9);

  let classification: Classification = 'U';
  const cls = asText(fields.CLASSIFICATION_TYPE)?.toUpperCase();
  if (cls === 'U' || cls === 'C' || cls === 'S') classification = cls;
  else if (cls !== undefined) err('CLASSIFICATION_TYPE', `CLASSIFICATION_TYPE "${cls}"`, 'U, C or S');

  let designator = '';
  const objectId = asText(fields.OBJECT_ID);
  if (objectId !== undefined) {
    const d = objectIdToDesignator(objectId);
    if (d === null) err('OBJECT_ID', `OBJECT_ID "${objectId}" is not an international designator`, 'YYYY-NNNP such as 2025-951C');
    else designator = d;
  }
  const name = asText(fields.OBJECT_NAME);
  if (name !== undefined && name.length > 80) err('OBJECT_NAME', 'OBJECT_NAME is longer than 80 characters', 'at most 80 characters');

  if (errors.length) return { record: null, errors };
  const base = {
    catalogNumber: formatCatalogNumber(cat),
    catalogNumberInt: cat,
    classification,
    internationalDesignator: designator,
    epoch: msToIso(epochMs),
    epochMs,
    meanMotionRevPerDay: n,
    meanMotionDotRevPerDay2: ndot,
    meanMotionDdotRevPerDay3: nddot,
    bstar,
    inclinationDeg: i,
    raanDeg: raan,
    eccentricity: e,
    argPerigeeDeg: argp,
    meanAnomalyDeg: ma,
    ephemerisType: eph,
    elementSetNo: elset,
    revAtEpoch: rev,
    sourceLine: recordLine,
  };
  const { line1, line2 } = writeTle(base);
  const record: ElementSet = { ...base, line1, line2, catalogNumberLine: fieldLine('NORAD_CAT_ID') };
  if (name !== undefined) record.name = name;
  return { record, errors };
}
