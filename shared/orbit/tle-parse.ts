import { isTrimWhitespace, readCatalogNumberAt } from './catalog-number';
import { dayOfYearToMs, isLeapYear, msToIso, tleYearToFullYear } from './epoch';
import { readAssumedDecimalExponent, readDecimal, readEccentricity, readUnsigned, tleChecksum } from './tle-fields';
import type { Classification, ElementSet, ParseError } from './types';

export type TleParseOptions = { verifyChecksum?: boolean };

const TLE_LINE_LENGTH = 69;
const LINE1_SPACES = [2, 18, 33, 44, 53];
const LINE2_SPACES = [2, 8, 17, 26, 34, 43, 52];
export const MAX_MEAN_MOTION_REV_PER_DAY = 20;

function isTleLine(line: string, digit: number): boolean {
  return line.charCodeAt(0) === digit && (line.length === 1 || line.charCodeAt(1) === 32);
}

function isBlank(line: string): boolean {
  for (let i = 0; i < line.length; i++) {
    const c = line.charCodeAt(i);
    if (c !== 32 && c !== 9 && c !== 13) return false;
  }
  return true;
}

function hasControlChars(line: string): boolean {
  for (let i = 0; i < line.length; i++) {
    const c = line.charCodeAt(i);
    if ((c < 32 && c !== 9) || c === 127 || c === 0xfffd) return true;
  }
  return false;
}

/** Strips the CR of CRLF and trailing blanks. */
function clean(raw: string): string {
  let end = raw.length;
  while (end > 0) {
    const c = raw.charCodeAt(end - 1);
    if (c === 13 || c === 32 || c === 9) end--;
    else break;
  }
  return end === raw.length ? raw : raw.slice(0, end);
}

function pushError(errors: ParseError[], line: number, columns: [number, number], field: string, message: string, expected: string): void {
  errors.push({ line, columns, field, message, expected });
}

const SHAPE_OK = 0;
/** Wrong length, a shifted field or a checksum that is not a digit: the fields cannot be read. */
const SHAPE_BROKEN = 1;
/** Well formed, but the stated checksum differs from the computed one (reported after the field errors). */
const SHAPE_CHECKSUM = 2;

function checkShape(
  line: string,
  lineNo: number,
  which: 1 | 2,
  spaces: readonly number[],
  verifyChecksum: boolean,
  errors: ParseError[],
): number {
  const n = line.length;
  if (n < TLE_LINE_LENGTH) {
    pushError(errors, lineNo, [1, n || 1], `line ${which}`, `line ${which} has ${n} characters`, `${TLE_LINE_LENGTH} characters`);
    return SHAPE_BROKEN;
  }
  if (n > TLE_LINE_LENGTH) {
    pushError(
      errors,
      lineNo,
      [TLE_LINE_LENGTH + 1, n],
      `line ${which}`,
      `unexpected text after column ${TLE_LINE_LENGTH}`,
      `${TLE_LINE_LENGTH} characters`,
    );
    return SHAPE_BROKEN;
  }
  let status = SHAPE_OK;
  for (let k = 0; k < spaces.length; k++) {
    const col = spaces[k]!;
    if (line.charCodeAt(col - 1) !== 32) {
      pushError(errors, lineNo, [col, col], 'separator', `column ${col} is "${line[col - 1]}", fields are shifted`, 'a space');
      status = SHAPE_BROKEN;
    }
  }
  const stated = line.charCodeAt(68) - 48;
  if (stated < 0 || stated > 9) {
    pushError(errors, lineNo, [69, 69], 'checksum', `checksum "${line[68]}" is not a digit`, 'a digit 0–9');
    status = SHAPE_BROKEN;
  } else if (verifyChecksum && tleChecksum(line) !== stated) {
    if (status === SHAPE_BROKEN) errors.push(checksumError(line, lineNo));
    else status = SHAPE_CHECKSUM;
  }
  return status;
}

function checksumError(line: string, lineNo: number): ParseError {
  const computed = tleChecksum(line);
  return {
    line: lineNo,
    columns: [69, 69],
    field: 'checksum',
    message: `checksum is ${line[68]} but columns 1–68 give ${computed}`,
    expected: String(computed),
  };
}

function readAngle(l2: string, s: number, e: number, field: string, max: number, lineNo: number, errors: ParseError[]): number {
  const v = readDecimal(l2, s, e);
  if (!Number.isFinite(v)) pushError(errors, lineNo, [s + 1, e], field, `"${l2.slice(s, e)}" is not a number`, 'degrees, e.g. " 34.2682"');
  else if (!(v >= 0 && v <= max)) pushError(errors, lineNo, [s + 1, e], field, `${v} is out of range`, `0 ≤ ${field} ≤ ${max}°`);
  return v;
}

/**
 * Parses one two-line set. `line1`/`line2` are without line endings; `line1No` is the 1-based line of line 1
 * (line 2 is taken as the next line unless `line2No` is given).
 */
export function parseTlePair(
  line1: string,
  line2: string,
  opts: { name?: string; line1No: number; line2No?: number; sourceLine?: number; verifyChecksum?: boolean },
): { record: ElementSet | null; errors: ParseError[] } {
  const errors: ParseError[] = [];
  const record = parsePairInto(
    clean(line1),
    clean(line2),
    opts.line1No,
    opts.line2No ?? opts.line1No + 1,
    opts.name,
    opts.sourceLine ?? opts.line1No,
    opts.verifyChecksum !== false,
    errors,
  );
  return { record, errors };
}

/**
 * Shape first (length, separators, checksum digit); when both lines have their shape the fields are read, and a
 * wrong checksum is reported after the field errors: a letter in a number names its field, then the checksum it
 * breaks.
 */
function parsePairInto(
  l1: string,
  l2: string,
  line1No: number,
  line2No: number,
  name: string | undefined,
  sourceLine: number,
  verify: boolean,
  errors: ParseError[],
): ElementSet | null {
  const shape1 = checkShape(l1, line1No, 1, LINE1_SPACES, verify, errors);
  const afterLine1 = errors.length;
  const shape2 = checkShape(l2, line2No, 2, LINE2_SPACES, verify, errors);
  if (shape1 === SHAPE_BROKEN || shape2 === SHAPE_BROKEN) {
    if (shape1 === SHAPE_CHECKSUM) errors.splice(afterLine1, 0, checksumError(l1, line1No));
    if (shape2 === SHAPE_CHECKSUM) errors.push(checksumError(l2, line2No));
    return null;
  }
  const record = readFields(l1, l2, line1No, line2No, name, sourceLine, errors);
  if (shape1 === SHAPE_OK && shape2 === SHAPE_OK) return record;
  if (shape1 === SHAPE_CHECKSUM) errors.push(checksumError(l1, line1No));
  if (shape2 === SHAPE_CHECKSUM) errors.push(checksumError(l2, line2No));
  return null;
}

function readFields(
  l1: string,
  l2: string,
  line1No: number,
  line2No: number,
  name: string | undefined,
  sourceLine: number,
  errors: ParseError[],
): ElementSet | null {
  const before = errors.length;
  let lineNo = line1No;

  const catalogNumberInt = readCatalogNumberAt(l1, 2);
  if (!Number.isFinite(catalogNumberInt))
    pushError(
      errors,
      lineNo,
      [3, 7],
      'catalog number',
      `"${l1.slice(2, 7)}" is not a catalog number`,
      'five digits, or alpha-5 (letter + four digits)',
    );
  const clsCode = l1.charCodeAt(7);
  let classification: Classification = 'U';
  if (clsCode === 67) classification = 'C';
  else if (clsCode === 83) classification = 'S';
  else if (clsCode !== 85 && clsCode !== 32) pushError(errors, lineNo, [8, 8], 'classification', `classification "${l1[7]}"`, 'U, C or S');
  let dStart = 9,
    dEnd = 17;
  while (dStart < dEnd && isTrimWhitespace(l1.charCodeAt(dStart))) dStart++;
  while (dEnd > dStart && isTrimWhitespace(l1.charCodeAt(dEnd - 1))) dEnd--;
  for (let i = dStart; i < dEnd; i++) {
    const c = l1.charCodeAt(i);
    if (!((c >= 48 && c <= 57) || (c >= 65 && c <= 90) || c === 32)) {
      pushError(
        errors,
        lineNo,
        [10, 17],
        'international designator',
        `"${l1.slice(dStart, dEnd)}" has invalid characters`,
        'digits and capital letters',
      );
      break;
    }
  }
  const yy = readUnsigned(l1, 18, 20, NaN);
  const day = readDecimal(l1, 20, 32);
  let epochMs = NaN;
  if (!(yy >= 0 && yy <= 99) || l1.charCodeAt(18) === 32)
    pushError(
      errors,
      lineNo,
      [19, 20],
      'epoch year',
      `"${l1.slice(18, 20)}" is not a two-digit year`,
      'two digits (57–99 → 19xx, 00–56 → 20xx)',
    );
  else {
    const year = tleYearToFullYear(yy);
    const maxDay = isLeapYear(year) ? 367 : 366;
    if (!(day >= 1 && day < maxDay))
      pushError(errors, lineNo, [21, 32], 'epoch day', `"${l1.slice(20, 32).trim()}" is not a day of ${year}`, `1 ≤ day < ${maxDay}`);
    else epochMs = dayOfYearToMs(year, day);
  }
  const ndot = readDecimal(l1, 33, 43);
  if (!Number.isFinite(ndot))
    pushError(errors, lineNo, [34, 43], 'mean motion dot/2', `"${l1.slice(33, 43)}" is not a number`, 'a decimal such as " .00000023"');
  const nddot = readAssumedDecimalExponent(l1, 44);
  if (!Number.isFinite(nddot))
    pushError(
      errors,
      lineNo,
      [45, 52],
      'mean motion ddot/6',
      `"${l1.slice(44, 52)}" is not an assumed-decimal exponent field`,
      'sign, 5 digits, signed exponent, e.g. " 00000-0"',
    );
  const bstar = readAssumedDecimalExponent(l1, 53);
  if (!Number.isFinite(bstar))
    pushError(
      errors,
      lineNo,
      [54, 61],
      'B*',
      `"${l1.slice(53, 61)}" is not an assumed-decimal exponent field`,
      'sign, 5 digits, signed exponent, e.g. " 28098-4"',
    );
  const eph = readUnsigned(l1, 62, 63, 0);
  if (!Number.isFinite(eph)) pushError(errors, lineNo, [63, 63], 'ephemeris type', `"${l1[62]}" is not a digit`, 'a digit or blank');
  const elset = readUnsigned(l1, 64, 68, 0);
  if (!Number.isFinite(elset))
    pushError(errors, lineNo, [65, 68], 'element set number', `"${l1.slice(64, 68)}" is not a number`, 'up to four digits');

  lineNo = line2No;
  const cat2 = readCatalogNumberAt(l2, 2);
  if (!Number.isFinite(cat2))
    pushError(errors, lineNo, [3, 7], 'catalog number', `"${l2.slice(2, 7)}" is not a catalog number`, 'five digits, or alpha-5');
  else if (Number.isFinite(catalogNumberInt) && cat2 !== catalogNumberInt)
    pushError(
      errors,
      lineNo,
      [3, 7],
      'catalog number',
      `line 2 has catalog number "${l2.slice(2, 7)}" but line 1 has "${l1.slice(2, 7)}"`,
      `"${l1.slice(2, 7)}"`,
    );
  const incl = readAngle(l2, 8, 16, 'inclination', 180, lineNo, errors);
  const raan = readAngle(l2, 17, 25, 'right ascension of the ascending node', 360, lineNo, errors);
  const ecc = readEccentricity(l2, 26);
  if (!Number.isFinite(ecc))
    pushError(
      errors,
      lineNo,
      [27, 33],
      'eccentricity',
      `"${l2.slice(26, 33)}" is not seven digits`,
      'seven digits with an assumed leading "0."',
    );
  const argp = readAngle(l2, 34, 42, 'argument of perigee', 360, lineNo, errors);
  const ma = readAngle(l2, 43, 51, 'mean anomaly', 360, lineNo, errors);
  const n = readDecimal(l2, 52, 63);
  if (!Number.isFinite(n))
    pushError(errors, lineNo, [53, 63], 'mean motion', `"${l2.slice(52, 63)}" is not a number`, 'rev/day, e.g. "15.49165230"');
  else if (!(n > 0 && n <= MAX_MEAN_MOTION_REV_PER_DAY))
    pushError(
      errors,
      lineNo,
      [53, 63],
      'mean motion',
      `${n} rev/day is out of range`,
      `0 < mean motion ≤ ${MAX_MEAN_MOTION_REV_PER_DAY} rev/day`,
    );
  const rev = readUnsigned(l2, 63, 68, 0);
  if (!Number.isFinite(rev))
    pushError(errors, lineNo, [64, 68], 'revolution number', `"${l2.slice(63, 68)}" is not a number`, 'up to five digits');

  if (errors.length > before) return null;
  let cStart = 2,
    cEnd = 7;
  while (cStart < cEnd && isTrimWhitespace(l1.charCodeAt(cStart))) cStart++;
  while (cEnd > cStart && isTrimWhitespace(l1.charCodeAt(cEnd - 1))) cEnd--;
  const record: ElementSet = {
    catalogNumber: cEnd - cStart === 5 ? l1.slice(2, 7) : l1.slice(cStart, cEnd).padStart(5, '0'),
    catalogNumberInt,
    classification,
    internationalDesignator: l1.slice(dStart, dEnd),
    epoch: msToIso(epochMs),
    epochMs,
    meanMotionRevPerDay: n,
    meanMotionDotRevPerDay2: ndot,
    meanMotionDdotRevPerDay3: nddot,
    bstar,
    inclinationDeg: incl,
    raanDeg: raan,
    eccentricity: ecc,
    argPerigeeDeg: argp,
    meanAnomalyDeg: ma,
    ephemerisType: eph,
    elementSetNo: elset,
    revAtEpoch: rev,
    sourceLine,
    line1: l1,
    line2: l2,
  };
  if (name !== undefined) record.name = name;
  return record;
}

/** Two-line and three-line sets: blank lines, CRLF and `#` comment lines are allowed; "0 " before a name is dropped. */
export function parseTleText(text: string, opts: TleParseOptions = {}): { records: ElementSet[]; errors: ParseError[] } {
  const lines = text.split('\n');
  const records: ElementSet[] = [];
  const errors: ParseError[] = [];
  let pendingName: string | undefined;
  let pendingNameLine = 0;
  const dropPendingName = function dropPendingName() {
    if (pendingName !== undefined) {
      errors.push({
        line: pendingNameLine,
        message: 'name line is not followed by line 1',
        expected: 'line 1 of a two-line set after a name line',
        field: 'name',
      });
      pendingName = undefined;
    }
  };
  const count = lines.length;
  const verify = opts.verifyChecksum !== false;
  for (let i = 0; i < count; i++) {
    const line = clean(lines[i]!);
    if (line.length === 0 || isBlank(line) || line.charCodeAt(0) === 35) continue;
    if (isTleLine(line, 49)) {
      let j = i + 1;
      while (j < count && isBlank(lines[j]!)) j++;
      const next = j < count ? clean(lines[j]!) : '';
      if (j < count && isTleLine(next, 50)) {
        const name = pendingName;
        const record = parsePairInto(line, next, i + 1, j + 1, name, name !== undefined ? pendingNameLine : i + 1, verify, errors);
        pendingName = undefined;
        if (record) records.push(record);
        i = j;
      } else {
        pendingName = undefined;
        errors.push({
          line: i + 1,
          columns: [1, 1],
          field: 'line number',
          message: 'line 1 is not followed by line 2',
          expected: 'a line starting "2 " next',
        });
      }
    } else if (isTleLine(line, 50)) {
      pendingName = undefined;
      errors.push({
        line: i + 1,
        columns: [1, 1],
        field: 'line number',
        message: 'line 2 without a line 1 before it',
        expected: 'a line starting "1 " first',
      });
    } else {
      dropPendingName();
      let name = line.trim();
      if (name.startsWith('0 ')) name = name.slice(2).trim();
      if (hasControlChars(name) || name.length > 80) {
        errors.push({
          line: i + 1,
          message: 'not a name line, line 1 or line 2',
          expected: 'a name of printable characters (at most 80), or a line starting "1 " or "2 "',
        });
      } else {
        pendingName = name;
        pendingNameLine = i + 1;
      }
    }
  }
  dropPendingName();
  return { records, errors };
}

/**
 * Cuts two-/three-line text into pieces of about `chars` characters, each ending right after a line that is a line 2
 * ("2 …"). parseTleText starts afresh after such a line (no name pending, no line 1 waiting for its line 2), so
 * parsing the pieces one after another, their line numbers moved on by `lineOffset`, gives what parsing the whole
 * text gives — in turns a caller can spread over time. A piece may be much longer than `chars` when no line 2 ends
 * near the cut.
 */
export function tleSlices(text: string, chars: number): Array<{ text: string; lineOffset: number }> {
  const out: Array<{ text: string; lineOffset: number }> = [];
  let start = 0;
  let lineOffset = 0;
  while (start < text.length) {
    let end = text.length;
    if (text.length - start > chars) {
      let lineStart = text.lastIndexOf('\n', start + chars - 1) + 1;
      if (lineStart < start) lineStart = start;
      for (let nl = text.indexOf('\n', lineStart); nl >= 0; nl = text.indexOf('\n', lineStart)) {
        if (isTleLine(clean(text.slice(lineStart, nl)), 50)) {
          end = nl + 1;
          break;
        }
        lineStart = nl + 1;
      }
    }
    out.push({ text: text.slice(start, end), lineOffset });
    for (let nl = text.indexOf('\n', start); nl >= 0 && nl < end; nl = text.indexOf('\n', nl + 1)) lineOffset++;
    start = end;
  }
  return out;
}
