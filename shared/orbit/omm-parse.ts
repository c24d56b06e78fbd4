// CCSDS OMM (502.0-B-2) in KVN, XML and JSON, and CSV with the OMM keywords as the header row.
import { XMLParser, XMLValidator } from 'fast-xml-parser';
import Papa from 'papaparse';
import { ommFieldsToElementSet, type OmmFields } from './omm-record';
import type { ElementSet, ParseError } from './types';

type Parsed = { records: ElementSet[]; errors: ParseError[] };

const KVN_MAX_LINE = 254;
/** Keywords that may repeat inside one message without starting the next one. */
const REPEATABLE = new Set(['COMMENT']);

function lineAt(text: string, index: number): number {
  let line = 1;
  for (let i = 0; i < index && i < text.length; i++) if (text.charCodeAt(i) === 10) line++;
  return line;
}

/** Line numbers of many offsets in one pass (offsets ascending). */
function linesAt(text: string, offsets: number[]): number[] {
  const out: number[] = [];
  let line = 1,
    pos = 0;
  for (const off of offsets) {
    for (; pos < off && pos < text.length; pos++) if (text.charCodeAt(pos) === 10) line++;
    out.push(line);
  }
  return out;
}

function push(out: Parsed, fields: OmmFields, line: number, fieldLine?: (k: string) => number) {
  const { record, errors } = ommFieldsToElementSet(fields, line, fieldLine);
  if (record) out.records.push(record);
  for (const e of errors) out.errors.push(e);
}

export function parseOmmKvn(text: string): Parsed {
  const out: Parsed = { records: [], errors: [] };
  const lines = text.split('\n');
  let fields: OmmFields | null = null;
  let keyLines: Record<string, number> = {};
  let start = 0;
  const finish = () => {
    if (fields) {
      const kl = keyLines;
      const s = start;
      push(out, fields, s, (k) => kl[k] ?? s);
    }
    fields = null;
    keyLines = {};
  };
  for (let i = 0; i < lines.length; i++) {
    const raw = lines[i]!;
    const t = raw.trim();
    if (t === '') continue;
    if (raw.replace(/\r$/, '').length > KVN_MAX_LINE) {
      out.errors.push({
        line: i + 1,
        columns: [KVN_MAX_LINE + 1, raw.length],
        message: `line is ${raw.length} characters long`,
        expected: `at most ${KVN_MAX_LINE} characters (KVN)`,
      });
      continue;
    }
    if (t.startsWith('COMMENT')) continue;
    const eq = t.indexOf('=');
    if (eq <= 0) {
      out.errors.push({ line: i + 1, message: `"${t.slice(0, 40)}" is not a KEYWORD = value line`, expected: 'KEYWORD = value' });
      continue;
    }
    const key = t.slice(0, eq).trim();
    if (!/^[A-Z][A-Z0-9_]*$/.test(key)) {
      out.errors.push({
        line: i + 1,
        columns: [1, eq],
        field: key.slice(0, 40),
        message: `"${key.slice(0, 40)}" is not a KVN keyword`,
        expected: 'capital letters, digits and "_"',
      });
      continue;
    }
    let value = t.slice(eq + 1).trim();
    const unit = value.lastIndexOf('[');
    if (unit > 0 && value.endsWith(']')) value = value.slice(0, unit).trim();
    if (key === 'CCSDS_OMM_VERS' || (fields && key in fields && !REPEATABLE.has(key))) finish();
    if (!fields) {
      fields = {};
      start = i + 1;
    }
    fields[key] = value;
    keyLines[key] = i + 1;
  }
  finish();
  return out;
}

function leafText(v: unknown): string | undefined {
  if (v === null || v === undefined) return undefined;
  if (typeof v === 'string' || typeof v === 'number' || typeof v === 'boolean') return String(v);
  if (typeof v === 'object' && '#text' in (v as Record<string, unknown>)) return String((v as Record<string, unknown>)['#text']);
  return undefined;
}

/** Collects KEYWORD leaves of an OMM segment's metadata and data sections. */
function flatten(node: unknown, into: OmmFields, depth = 0) {
  if (!node || typeof node !== 'object' || depth > 6) return;
  for (const [k, v] of Object.entries(node as Record<string, unknown>)) {
    if (k.startsWith('@_') || k === '#text') continue;
    if (/^[A-Z][A-Z0-9_]*$/.test(k)) {
      const s = leafText(Array.isArray(v) ? v[0] : v);
      if (s !== undefined) into[k] = s;
    } else flatten(Array.isArray(v) ? v[0] : v, into, depth + 1);
  }
}

const xmlParser = new XMLParser({
  ignoreAttributes: false,
  removeNSPrefix: true,
  parseTagValue: false,
  trimValues: true,
  processEntities: false,
  isArray: (name) => name === 'omm' || name === 'segment',
});

type XmlValidatorError = { code: string; msg: string; line: number; col: number };

/**
 * The XML validator's finding in words a user reads: where (line and column), which element, what is wrong, and
 * what was expected there. Unknown findings keep the validator's own text.
 */
export function xmlSyntaxError(err: XmlValidatorError): ParseError {
  const line = Number.isInteger(err.line) && err.line >= 1 ? err.line : 1;
  const col = Number.isInteger(err.col) && err.col >= 1 ? err.col : undefined;
  const where = col ? `XML: line ${line}, column ${col}` : `XML: line ${line}`;
  const msg = String(err.msg ?? '');
  let field: string | undefined;
  let what = msg;
  let expected = 'well-formed XML';
  let m: RegExpMatchArray | null;
  if ((m = msg.match(/^Expected closing tag '(.*)' \(opened in line (\d+), col (\d+)\) instead of closing tag '(.*)'\.$/))) {
    field = m[1];
    what = `</${m[4]}> where </${m[1]}> was expected (<${m[1]}> opened on line ${m[2]}, column ${m[3]})`;
    expected = `</${m[1]}>`;
  } else if ((m = msg.match(/^Closing tag '(.*)' has not been opened\.$/))) {
    field = m[1];
    what = `</${m[1]}> closes an element that is not open`;
    expected = `an opening <${m[1]}> before it, or no </${m[1]}>`;
  } else if ((m = msg.match(/^Closing tag '(.*)' doesn't have proper closing\.$/))) {
    field = m[1];
    what = `</${m[1]}> does not end with ">"`;
    expected = `</${m[1]}>`;
  } else if ((m = msg.match(/^Closing tag '(.*)' can't have attributes or invalid starting\.$/))) {
    field = m[1];
    what = `</${m[1]}> has text inside the closing tag`;
    expected = `</${m[1]}> alone`;
  } else if ((m = msg.match(/^Unclosed tag '(.*)'\.$/))) {
    field = m[1];
    what = `<${m[1]}> is opened here but never closed`;
    expected = `</${m[1]}> before the end of the file`;
  } else if ((m = msg.match(/^Invalid '\[(.*)\]' found\.$/))) {
    const names = [...m[1]!.matchAll(/"([^"]*)"/g)].map((x) => x[1]!);
    field = names[names.length - 1];
    what = `elements never closed: ${names.map((n) => `<${n}>`).join(', ')}`;
    expected = `a closing tag for each, innermost first (</${names[names.length - 1] ?? ''}> first)`;
  } else if ((m = msg.match(/^Tag '(.*)' is an invalid name\.$/))) {
    field = m[1];
    what = `"<${m[1]}" is not a valid element name`;
    expected = 'an element name of letters, digits, "_", "-", "." or ":" starting with a letter or "_"';
  } else if (msg === "Invalid space after '<'.") {
    what = 'a "<" followed by a space';
    expected = 'an element name right after "<", or "&lt;" for a literal "<"';
  } else if ((m = msg.match(/^Attributes for '(.*)' have open quote\.$/))) {
    field = m[1];
    what = `an attribute of <${m[1]}> has no closing quote`;
    expected = 'name="value" with both quotes';
  } else if ((m = msg.match(/^Attribute '(.*)' (is without value|has no space in starting|is repeated|is an invalid name)\.$/))) {
    field = m[1];
    what = `the attribute "${m[1]}" ${m[2] === 'is without value' ? 'has no value' : m[2] === 'has no space in starting' ? 'is not separated by a space' : m[2] === 'is repeated' ? 'appears twice' : 'has an invalid name'}`;
    expected = 'name="value", each name once, separated by spaces';
  } else if ((m = msg.match(/^boolean attribute '(.*)' is not allowed\.$/))) {
    field = m[1];
    what = `the attribute "${m[1]}" has no value`;
    expected = `${m[1]}="value"`;
  } else if (msg === "char '&' is not expected.") {
    what = 'an "&" that starts no entity';
    expected = '"&amp;" for a literal "&"';
  } else if ((m = msg.match(/^char '(.*)' is not expected\.$/))) {
    what = `"${m[1]}" outside any element`;
    expected = 'elements only, e.g. <ndm>…</ndm>';
  } else if (msg === 'Extra text at the end') {
    what = 'text after the last closing tag';
    expected = 'nothing after the closing tag of the root element';
  } else if (msg === 'Multiple possible root nodes found.') {
    what = 'a second top-level element';
    expected = 'one root element (<ndm> or <omm>) around everything';
  } else if (msg === 'Start tag expected.') {
    what = 'no element found';
    expected = '<ndm><omm>… or <omm>… (CCSDS 502.0-B-2)';
  } else if (msg === 'XML declaration allowed only at the start of the document.') {
    what = 'an <?xml …?> declaration that is not at the very start';
    expected = '<?xml …?> on the first line, or none';
  }
  const e: ParseError = { line, message: `${where}: ${what}`, expected };
  if (col) e.columns = [col, col];
  if (field) e.field = field;
  return e;
}

export function parseOmmXml(text: string): Parsed {
  const out: Parsed = { records: [], errors: [] };
  const valid = XMLValidator.validate(text);
  if (valid !== true) {
    out.errors.push(xmlSyntaxError(valid.err));
    return out;
  }
  let doc: Record<string, unknown>;
  try {
    doc = xmlParser.parse(text) as Record<string, unknown>;
  } catch (e) {
    out.errors.push({ line: 1, message: `XML: ${(e as Error).message}`, expected: 'well-formed XML' });
    return out;
  }
  const ndm = doc.ndm as Record<string, unknown> | undefined;
  const omms = (ndm?.omm ?? doc.omm) as unknown[] | undefined;
  if (!Array.isArray(omms) || omms.length === 0) {
    out.errors.push({ line: 1, message: 'no <omm> element found', expected: '<ndm><omm>… or <omm>… (CCSDS 502.0-B-2)' });
    return out;
  }
  const segOffsets: number[] = [];
  const re = /<(?:[A-Za-z_][\w.-]*:)?segment[\s>]/g;
  for (let m = re.exec(text); m; m = re.exec(text)) segOffsets.push(m.index);
  const segLines = linesAt(text, segOffsets);
  let segIndex = 0;
  for (const omm of omms) {
    const segments = ((omm as Record<string, unknown> | null)?.body as Record<string, unknown> | undefined)?.segment as
      unknown[] | undefined;
    if (!Array.isArray(segments)) {
      out.errors.push({
        line: segLines[segIndex] ?? 1,
        message: '<omm> without <body><segment>',
        expected: '<body><segment><metadata>…<data>…',
      });
      continue;
    }
    for (const seg of segments) {
      const line = segLines[segIndex++] ?? 1;
      const fields: OmmFields = {};
      flatten(seg, fields);
      push(out, fields, line);
    }
  }
  return out;
}

/** Line of each top-level object in a JSON array (string-aware scan). */
function jsonObjectLines(text: string): number[] {
  const lines: number[] = [];
  let depth = 0,
    line = 1,
    inString = false;
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i);
    if (c === 10) line++;
    if (inString) {
      if (c === 92) i++;
      else if (c === 34) inString = false;
      continue;
    }
    if (c === 34) inString = true;
    else if (c === 91 || c === 123) {
      if (c === 123 && depth === 1) lines.push(line);
      depth++;
    } else if (c === 93 || c === 125) depth--;
  }
  return lines;
}

export function parseOmmJson(text: string): Parsed {
  const out: Parsed = { records: [], errors: [] };
  let data: unknown;
  try {
    data = JSON.parse(text);
  } catch (e) {
    const msg = (e as Error).message;
    const pos = /position (\d+)/.exec(msg);
    out.errors.push({ line: pos ? lineAt(text, Number(pos[1])) : 1, message: `JSON: ${msg}`, expected: 'a JSON array of OMM objects' });
    return out;
  }
  const list = Array.isArray(data) ? data : [data];
  const lines = Array.isArray(data) ? jsonObjectLines(text) : [1];
  list.forEach((item, k) => {
    const line = lines[k] ?? 1;
    if (!item || typeof item !== 'object' || Array.isArray(item)) {
      out.errors.push({ line, message: `item ${k + 1} is not an object`, expected: 'an object with OMM keywords as keys' });
      return;
    }
    const fields: OmmFields = {};
    for (const [key, v] of Object.entries(item as Record<string, unknown>)) {
      if (v === null || typeof v === 'string' || typeof v === 'number' || typeof v === 'boolean') fields[key.toUpperCase()] = v;
    }
    push(out, fields, line);
  });
  return out;
}

export function parseOmmCsv(text: string): Parsed {
  const out: Parsed = { records: [], errors: [] };
  const result = Papa.parse<string[]>(text, { header: false, skipEmptyLines: false, dynamicTyping: false });
  for (const e of result.errors) {
    if (e.code === 'UndetectableDelimiter') continue;
    out.errors.push({ line: (e.row ?? 0) + 1, message: `CSV: ${e.message}`, expected: 'comma-separated values with a header row' });
  }
  const rows = result.data;
  let header: string[] | null = null;
  for (let r = 0; r < rows.length; r++) {
    const row = rows[r]!;
    if (row.length === 1 && row[0]!.trim() === '') continue;
    if (!header) {
      header = row.map((h) => h.trim().toUpperCase());
      if (!header.includes('EPOCH') || !header.includes('MEAN_MOTION')) {
        out.errors.push({
          line: r + 1,
          message: 'header row lacks EPOCH or MEAN_MOTION',
          expected: 'OMM keywords as the header (EPOCH, MEAN_MOTION, ECCENTRICITY, …)',
        });
        return out;
      }
      continue;
    }
    if (row.length !== header.length) {
      out.errors.push({
        line: r + 1,
        message: `row has ${row.length} cells, the header has ${header.length}`,
        expected: `${header.length} cells`,
      });
      continue;
    }
    const fields: OmmFields = {};
    for (let c = 0; c < header.length; c++) if (header[c]) fields[header[c]!] = row[c];
    push(out, fields, r + 1);
  }
  if (!header) out.errors.push({ line: 1, message: 'no header row', expected: 'OMM keywords as the header' });
  return out;
}
