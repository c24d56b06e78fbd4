// Column readers for the fixed-column two-line format. Indices are 0-based, end exclusive; each returns NaN
// when the text is not a number of the expected form, so a caller can name the field and columns.
const POW10 = Array.from({ length: 23 }, (_, i) => 10 ** i);

/** Decimal number with optional sign and point, padded with spaces: " .00000023", " 34.2682", "10.82419157". */
export function readDecimal(line: string, start: number, end: number): number {
  let i = start;
  while (i < end && line.charCodeAt(i) === 32) i++;
  let sign = 1;
  const s = line.charCodeAt(i);
  if (s === 45) {
    sign = -1;
    i++;
  } else if (s === 43) i++;
  let mantissa = 0,
    fracDigits = 0,
    digitCount = 0,
    seenPoint = false;
  for (; i < end; i++) {
    const c = line.charCodeAt(i);
    if (c >= 48 && c <= 57) {
      mantissa = mantissa * 10 + (c - 48);
      digitCount++;
      if (seenPoint) fracDigits++;
    } else if (c === 46 && !seenPoint) seenPoint = true;
    else break;
  }
  for (; i < end; i++) if (line.charCodeAt(i) !== 32) return NaN;
  if (digitCount === 0 || fracDigits > 22) return NaN;
  return (sign * mantissa) / POW10[fracDigits]!;
}

/** Unsigned integer padded with spaces; all-blank gives `blank`. */
export function readUnsigned(line: string, start: number, end: number, blank: number): number {
  let i = start;
  while (i < end && line.charCodeAt(i) === 32) i++;
  if (i === end) return blank;
  let v = 0,
    n = 0;
  for (; i < end; i++) {
    const c = line.charCodeAt(i);
    if (c < 48 || c > 57) break;
    v = v * 10 + (c - 48);
    n++;
  }
  for (; i < end; i++) if (line.charCodeAt(i) !== 32) return NaN;
  return n ? v : NaN;
}

/**
 * Assumed-decimal exponent field, 8 columns: sign, five mantissa digits with an assumed leading "0.", signed
 * one-digit exponent — " 28098-4" = 0.28098e-4. An all-blank field is 0.
 */
export function readAssumedDecimalExponent(line: string, start: number): number {
  let blank = true;
  for (let i = start; i < start + 8; i++)
    if (line.charCodeAt(i) !== 32) {
      blank = false;
      break;
    }
  if (blank) return 0;
  const s = line.charCodeAt(start);
  let sign: number;
  if (s === 32 || s === 43) sign = 1;
  else if (s === 45) sign = -1;
  else return NaN;
  let mantissa = 0;
  let i = start + 1;
  while (i < start + 6 && line.charCodeAt(i) === 32) i++; // leading blanks in the mantissa count as zeros
  for (; i < start + 6; i++) {
    const c = line.charCodeAt(i) - 48;
    if (c < 0 || c > 9) return NaN;
    mantissa = mantissa * 10 + c;
  }
  const es = line.charCodeAt(start + 6);
  let expSign: number;
  if (es === 45) expSign = -1;
  else if (es === 43 || es === 32) expSign = 1;
  else return NaN;
  const e = line.charCodeAt(start + 7) - 48;
  if (e < 0 || e > 9) return NaN;
  const exp = expSign * e - 5;
  return exp >= 0 ? sign * mantissa * POW10[exp]! : (sign * mantissa) / POW10[-exp]!;
}

/** Seven eccentricity digits with an assumed leading "0." (leading blanks count as zeros). */
export function readEccentricity(line: string, start: number): number {
  let v = 0,
    i = start;
  while (i < start + 7 && line.charCodeAt(i) === 32) i++;
  if (i === start + 7) return NaN;
  for (; i < start + 7; i++) {
    const c = line.charCodeAt(i) - 48;
    if (c < 0 || c > 9) return NaN;
    v = v * 10 + c;
  }
  return v / 1e7;
}

/** Modulo-10 checksum of columns 1–68: digits count their value, '-' counts 1, everything else 0. */
export function tleChecksum(line: string): number {
  let sum = 0;
  const n = Math.min(line.length, 68);
  for (let i = 0; i < n; i++) {
    const c = line.charCodeAt(i);
    if (c >= 48 && c <= 57) sum += c - 48;
    else if (c === 45) sum += 1;
  }
  return sum % 10;
}
