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
  // Most cells start with a letter or digit: decided by the first character alone.
  const c = value.charCodeAt(0);
  if (c !== 61 && c !== 43 && c !== 45 && c !== 64 && c !== 9 && c !== 13) return value;
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

/**
 * Rows already as cells (one array per row, in header order) as CSV chunks of `chunkRows` rows each, header first:
 * the same writer and the same neutralising as toCsv, for exports large enough to send while they are written.
 */
export function* csvChunks(headers: readonly string[], rows: readonly CsvCell[][], chunkRows = 2000): Generator<string> {
  const options = { newline: '\r\n', quotes: false, escapeFormulae: false } as const;
  yield Papa.unparse([headers.map(neutraliseCell)], options) + '\r\n';
  for (let i = 0; i < rows.length; i += chunkRows) {
    const end = Math.min(rows.length, i + chunkRows);
    const data = new Array<string[]>(end - i);
    for (let k = i; k < end; k++) {
      const row = rows[k]!;
      const cells = new Array<string>(row.length);
      for (let j = 0; j < row.length; j++) cells[j] = neutraliseCell(row[j]);
      data[k - i] = cells;
    }
    yield Papa.unparse(data, options) + '\r\n';
  }
}
