import { formatCatalogNumber, parseCatalogNumber } from './catalog-number';
import { msToDayOfYear } from './epoch';
import { tleChecksum } from './tle-fields';
import type { ElementSet } from './types';

/** What the writer needs; `line1`, `line2`, `sourceLine` and the ISO epoch are not read. */
export type TleWriteInput = Pick<
  ElementSet,
  | 'catalogNumber'
  | 'classification'
  | 'internationalDesignator'
  | 'epochMs'
  | 'meanMotionRevPerDay'
  | 'meanMotionDotRevPerDay2'
  | 'meanMotionDdotRevPerDay3'
  | 'bstar'
  | 'inclinationDeg'
  | 'raanDeg'
  | 'eccentricity'
  | 'argPerigeeDeg'
  | 'meanAnomalyDeg'
  | 'elementSetNo'
  | 'revAtEpoch'
> & { name?: string; ephemerisType?: number; catalogNumberInt?: number };

function fixed(value: number, decimals: number, width: number): string {
  return value.toFixed(decimals).padStart(width, ' ');
}

function angle(deg: number): string {
  let a = ((deg % 360) + 360) % 360;
  if (Number(a.toFixed(4)) >= 360) a = 0;
  return fixed(a, 4, 8);
}

/** ṅ/2 field: sign and 8 decimals without the leading zero, e.g. " .00000023", "-.00000084"; clamped to ±.99999999. */
function firstDerivative(value: number): string {
  const v = Math.max(-0.99999999, Math.min(0.99999999, value));
  const s = Math.abs(v).toFixed(8); // "0.00000023"
  return (v < 0 && Number(s) !== 0 ? '-' : ' ') + s.slice(1);
}

/** Assumed-decimal exponent field: " 28098-4" = 0.28098e-4; zero and values below 1e-10 write " 00000-0". */
export function formatAssumedDecimalExponent(value: number): string {
  if (!Number.isFinite(value) || value === 0) return ' 00000-0';
  const sign = value < 0 ? '-' : ' ';
  const a = Math.abs(value);
  let exp = Math.floor(Math.log10(a)) + 1;
  let mantissa = Math.round(a / 10 ** (exp - 5));
  if (mantissa >= 100_000) {
    mantissa = Math.round(mantissa / 10);
    exp += 1;
  }
  if (mantissa < 10_000 && mantissa > 0) {
    mantissa = Math.round(a / 10 ** (exp - 6));
    exp -= 1;
  }
  if (exp < -9) return ' 00000-0';
  if (exp > 9) return `${sign}99999+9`;
  return `${sign}${String(mantissa).padStart(5, '0')}${exp < 0 ? '-' : '+'}${Math.abs(exp)}`;
}

function epochField(epochMs: number): string {
  const epoch = msToDayOfYear(epochMs);
  let fullYear = epoch.fullYear;
  const dayOfYear = epoch.dayOfYear;
  let day = dayOfYear.toFixed(8);
  // Rounding up to the next whole day at the year's end belongs to the next year.
  const yearDays = (Date.UTC(fullYear + 1, 0, 1) - Date.UTC(fullYear, 0, 1)) / 86_400_000;
  if (Number(day) >= yearDays + 1) {
    fullYear += 1;
    day = (1).toFixed(8);
  }
  return String(fullYear % 100).padStart(2, '0') + day.padStart(12, '0');
}

function withChecksum(line68: string): string {
  return line68 + String(tleChecksum(line68));
}

/** Writes the two lines of a set in the published column layout, each with its modulo-10 checksum. */
export function writeTle(set: TleWriteInput): { line1: string; line2: string } {
  const catInt = set.catalogNumberInt ?? parseCatalogNumber(set.catalogNumber);
  const cat = formatCatalogNumber(Number.isFinite(catInt) ? catInt : 0);
  const intl = (set.internationalDesignator ?? '').slice(0, 8).padEnd(8, ' ');
  const eph = String(Math.max(0, Math.min(9, Math.trunc(set.ephemerisType ?? 0))));
  const elset = String(Math.abs(Math.trunc(set.elementSetNo)) % 10_000).padStart(4, ' ');
  const line1 =
    `1 ${cat}${set.classification || 'U'} ${intl} ${epochField(set.epochMs)} ${firstDerivative(set.meanMotionDotRevPerDay2)} ` +
    `${formatAssumedDecimalExponent(set.meanMotionDdotRevPerDay3)} ${formatAssumedDecimalExponent(set.bstar)} ${eph} ${elset}`;
  const e = Math.max(0, Math.min(9_999_999, Math.round(set.eccentricity * 1e7)));
  const incl = fixed(Math.max(0, Math.min(180, set.inclinationDeg)), 4, 8);
  const n = Math.max(0, Math.min(99.99999999, set.meanMotionRevPerDay));
  const rev = String(Math.abs(Math.trunc(set.revAtEpoch)) % 100_000).padStart(5, ' ');
  const line2 =
    `2 ${cat} ${incl} ${angle(set.raanDeg)} ${String(e).padStart(7, '0')} ${angle(set.argPerigeeDeg)} ` +
    `${angle(set.meanAnomalyDeg)} ${fixed(n, 8, 11)}${rev}`;
  return { line1: withChecksum(line1), line2: withChecksum(line2) };
}

/** A file of sets, one per two (or, with names, three) lines, CRLF-free, ending with a newline. */
export function formatTleFile(sets: readonly TleWriteInput[], opts: { withNames?: boolean } = {}): string {
  const out: string[] = [];
  for (const s of sets) {
    const { line1, line2 } = writeTle(s);
    if (opts.withNames) out.push((s.name ?? s.catalogNumber).slice(0, 24));
    out.push(line1, line2);
  }
  return out.join('\n') + '\n';
}
