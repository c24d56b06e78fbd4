// CSV written by papaparse, with formula injection neutralised: a cell a spreadsheet would run as a formula
// (starting with = + - @, tab or carriage return; OWASP "CSV Injection") gets a leading apostrophe.
import Papa from 'papaparse';

const FORMULA_START = /^[=+\-@\t\r]/;

export function neutraliseCell(value: unknown): string | number | boolean | null {
  if (value === null || value === undefined) return null;
  if (typeof value === 'number' || typeof value === 'boolean') return value;
  const text = value instanceof Date ? value.toISOString() : String(value);
  return FORMULA_START.test(text) ? `'${text}` : text;
}

/** Rows as objects; `columns` fixes the header and its order. Numbers stay numbers (negative amounts are not formulas). */
export function toCsv(rows: Record<string, unknown>[], columns: string[]): string {
  const data = rows.map((r) => columns.map((c) => neutraliseCell(r[c])));
  return Papa.unparse({ fields: columns, data }, { newline: '\r\n', quotes: false, escapeFormulae: false });
}
