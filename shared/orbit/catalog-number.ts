// Alpha-5 catalog numbers: above 99999 the first character is a letter (I and O skipped) standing for 10…33.
const ALPHA5_LETTERS = 'ABCDEFGHJKLMNPQRSTUVWXYZ';

/** Parses a 5-character catalog field (digits, leading spaces allowed, or alpha-5). NaN when invalid. */
export function parseCatalogNumber(field: string): number {
  const s = field.trim();
  if (s.length === 0 || s.length > 5) return NaN;
  let value = 0;
  let start = 0;
  const first = s.charCodeAt(0);
  if (first >= 65 && first <= 90) {
    if (s.length !== 5) return NaN;
    const idx = ALPHA5_LETTERS.indexOf(s[0]!);
    if (idx < 0) return NaN;
    value = idx + 10;
    start = 1;
  }
  for (let i = start; i < s.length; i++) {
    const c = s.charCodeAt(i) - 48;
    if (c < 0 || c > 9) return NaN;
    value = value * 10 + c;
  }
  return value;
}

/** Whitespace as String#trim sees it. */
export function isTrimWhitespace(c: number): boolean {
  return (
    c === 32 ||
    (c >= 9 && c <= 13) ||
    c === 0xa0 ||
    c === 0x1680 ||
    (c >= 0x2000 && c <= 0x200a) ||
    c === 0x2028 ||
    c === 0x2029 ||
    c === 0x202f ||
    c === 0x205f ||
    c === 0x3000 ||
    c === 0xfeff
  );
}

/** `parseCatalogNumber(line.slice(start, start + 5))` without building the slice (the parser's hot path). */
export function readCatalogNumberAt(line: string, start: number): number {
  let s = start,
    e = Math.min(start + 5, line.length);
  while (s < e && isTrimWhitespace(line.charCodeAt(s))) s++;
  while (e > s && isTrimWhitespace(line.charCodeAt(e - 1))) e--;
  if (s === e) return NaN;
  let value = 0;
  const first = line.charCodeAt(s);
  if (first >= 65 && first <= 90) {
    if (e - s !== 5) return NaN;
    const idx = ALPHA5_LETTERS.indexOf(line[s]!);
    if (idx < 0) return NaN;
    value = idx + 10;
    s++;
  }
  for (let i = s; i < e; i++) {
    const c = line.charCodeAt(i) - 48;
    if (c < 0 || c > 9) return NaN;
    value = value * 10 + c;
  }
  return value;
}

/** Largest number alpha-5 can write: Z9999. */
export const MAX_CATALOG_NUMBER = 339_999;

/** Writes a catalog number as the 5-character TLE field ("00005", "A0001"). */
export function formatCatalogNumber(value: number): string {
  const n = Math.trunc(value);
  if (!(n >= 0 && n <= MAX_CATALOG_NUMBER)) throw new RangeError(`catalog number ${value} outside 0…${MAX_CATALOG_NUMBER}`);
  if (n <= 99_999) return String(n).padStart(5, '0');
  const lead = Math.floor(n / 10_000);
  return ALPHA5_LETTERS[lead - 10]! + String(n % 10_000).padStart(4, '0');
}
