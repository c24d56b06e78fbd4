import Papa from 'papaparse';

// The one way the product writes CSV: papaparse quotes by RFC 4180 (CRLF rows, doubled quotes), and cells a
// spreadsheet would run as a formula are made inert with a leading single quote (OWASP, "CSV Injection":
// cells starting with = + - @ tab or carriage return).

export type CsvCell = string | number | boolean | null | undefined;
export type CsvColumn<Row> = { header: string; value: (row: Row) => CsvCell };

const FORMULA_START = /^[=+\-@\t\r]/;
// A plain number ("-12.5", "+7", "-2.1e-3") is data, not a formula: it keeps its sign.
const NUMBER = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;

/** A cell as text a spreadsheet shows and never evaluates. */
export function neutraliseCell(value: CsvCell): string {
  if (value === null || value === undefined) return '';
  if (typeof value !== 'string') return String(value);
  return FORMULA_START.test(value) && !NUMBER.test(value) ? `'${value}` : value;
}

/** Rows as CSV text with a header row, CRLF line ends and a final line end. */
export function toCsv<Row>(rows: readonly Row[], columns: readonly CsvColumn<Row>[]): string {
  const data = rows.map((row) => columns.map((c) => neutraliseCell(c.value(row))));
  const text = Papa.unparse(
    { fields: columns.map((c) => neutraliseCell(c.header)), data },
    { newline: '\r\n', quotes: false, escapeFormulae: false },
  );
  return `${text}\r\n`;
}

/** Plain records as CSV, one column per key in `columns` (header = key), through the same neutralising writer. */
export function recordsToCsv(rows: readonly Record<string, unknown>[], columns: readonly string[]): string {
  return toCsv(
    rows,
    columns.map((c) => ({ header: c, value: (r: Record<string, unknown>) => r[c] as CsvCell })),
  );
}
