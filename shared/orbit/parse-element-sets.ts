import { detectFormat } from './detect-format';
import { parseOmmCsv, parseOmmJson, parseOmmKvn, parseOmmXml } from './omm-parse';
import { parseTleText } from './tle-parse';
import type { ElementSet, ParseError, ParseOptions, ParseResult } from './types';

function allFinite(r: ElementSet): boolean {
  // Every numeric field, spelled out: a loop of keyed loads costs more than the parse of the field.
  return (
    Number.isFinite(r.catalogNumberInt) &&
    Number.isFinite(r.epochMs) &&
    Number.isFinite(r.meanMotionRevPerDay) &&
    Number.isFinite(r.meanMotionDotRevPerDay2) &&
    Number.isFinite(r.meanMotionDdotRevPerDay3) &&
    Number.isFinite(r.bstar) &&
    Number.isFinite(r.inclinationDeg) &&
    Number.isFinite(r.raanDeg) &&
    Number.isFinite(r.eccentricity) &&
    Number.isFinite(r.argPerigeeDeg) &&
    Number.isFinite(r.meanAnomalyDeg) &&
    Number.isFinite(r.ephemerisType) &&
    Number.isFinite(r.elementSetNo) &&
    Number.isFinite(r.revAtEpoch)
  );
}

/**
 * Parses two-/three-line sets or CCSDS OMM (KVN, XML, JSON, CSV), detected from the content. Returns the good
 * records and every error (line, columns for fixed-column sets, field, what was expected); never throws.
 */
export function parseElementSets(text: string, opts: ParseOptions = {}): ParseResult {
  const maxErrors = opts.maxErrors ?? 1000;
  let format: ParseResult['format'] = opts.format ?? 'unknown';
  let records: ElementSet[] = [];
  let errors: ParseError[] = [];
  try {
    if (typeof text !== 'string') {
      return { format: 'unknown', records: [], errors: [{ line: 1, message: 'input is not text', expected: 'a string' }] };
    }
    const body = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
    if (!opts.format) format = detectFormat(body);
    let parsed: { records: ElementSet[]; errors: ParseError[] };
    switch (format) {
      case 'tle':
        parsed = parseTleText(body, { verifyChecksum: opts.verifyChecksum });
        break;
      case 'omm-kvn':
        parsed = parseOmmKvn(body);
        break;
      case 'omm-xml':
        parsed = parseOmmXml(body);
        break;
      case 'omm-json':
        parsed = parseOmmJson(body);
        break;
      case 'omm-csv':
        parsed = parseOmmCsv(body);
        break;
      default:
        parsed = {
          records: [],
          errors: [
            { line: 1, message: 'format not recognised', expected: 'two-/three-line element sets, or CCSDS OMM as KVN, XML, JSON or CSV' },
          ],
        };
    }
    records = parsed.records;
    errors = parsed.errors;
  } catch (e) {
    // A parser bug must not escape to the caller; report it as an error on the whole input.
    records = [];
    errors = [{ line: 1, message: `internal parser failure: ${(e as Error)?.message ?? String(e)}`, expected: 'a parsable file' }];
  }
  let bad = 0;
  for (let k = 0; k < records.length; k++) if (!allFinite(records[k]!)) bad++;
  const good = bad === 0 ? records : records.filter(allFinite);
  if (bad > 0) {
    for (const r of records)
      if (!allFinite(r)) errors.push({ line: r.sourceLine, message: 'record has a non-finite number', expected: 'finite numbers' });
  }
  if (errors.length > maxErrors) {
    const more = errors.length - maxErrors;
    errors = errors.slice(0, maxErrors);
    errors.push({ line: errors[maxErrors - 1]?.line ?? 1, message: `${more} more errors not listed`, expected: 'fewer errors' });
  }
  return { format, records: good, errors };
}
