import { MS_PER_DAY } from './constants';

/** Two-digit TLE year: 57–99 → 1957–1999, 00–56 → 2000–2056 (the published rule). */
export function tleYearToFullYear(twoDigitYear: number): number {
  return twoDigitYear < 57 ? 2000 + twoDigitYear : 1900 + twoDigitYear;
}

export function isLeapYear(year: number): boolean {
  return (year % 4 === 0 && year % 100 !== 0) || year % 400 === 0;
}

/** Day-of-year with fraction (day 1.0 = 1 January 00:00 UTC) → Unix ms. */
export function dayOfYearToMs(fullYear: number, dayOfYear: number): number {
  return Date.UTC(fullYear, 0, 1) + (dayOfYear - 1) * MS_PER_DAY;
}

/** Unix ms → { fullYear, dayOfYear } with day 1.0 = 1 January 00:00 UTC. */
export function msToDayOfYear(ms: number): { fullYear: number; dayOfYear: number } {
  const fullYear = new Date(Math.floor(ms)).getUTCFullYear();
  return { fullYear, dayOfYear: (ms - Date.UTC(fullYear, 0, 1)) / MS_PER_DAY + 1 };
}

/** ISO 8601 UTC with milliseconds, same text as Date#toISOString (faster: no Date object for years 1000–9999); '' when not a valid time. */
export function msToIso(ms: number): string {
  if (!Number.isFinite(ms) || Math.abs(ms) > 8.64e15) return '';
  const t = Math.round(ms);
  const days = Math.floor(t / 86_400_000);
  let rem = t - days * 86_400_000;
  // Civil date from days since 1970-01-01 (H. Hinnant's algorithm).
  const z = days + 719_468;
  const era = Math.floor(z / 146_097);
  const doe = z - era * 146_097;
  const yoe = Math.floor((doe - Math.floor(doe / 1460) + Math.floor(doe / 36_524) - Math.floor(doe / 146_096)) / 365);
  const doy = doe - (365 * yoe + Math.floor(yoe / 4) - Math.floor(yoe / 100));
  const mp = Math.floor((5 * doy + 2) / 153);
  const d = doy - Math.floor((153 * mp + 2) / 5) + 1;
  const m = mp < 10 ? mp + 3 : mp - 9;
  const y = yoe + era * 400 + (m <= 2 ? 1 : 0);
  if (!(y >= 1000 && y <= 9999)) return new Date(t).toISOString();
  const h = Math.floor(rem / 3_600_000);
  rem -= h * 3_600_000;
  const mi = Math.floor(rem / 60_000);
  rem -= mi * 60_000;
  const sec = Math.floor(rem / 1000);
  const msPart = rem - sec * 1000;
  // One flat string from its character codes: a template literal builds a rope of a dozen pieces, and keeping
  // 100k of those (one per parsed set) costs the garbage collector ten times what the arithmetic does.
  return String.fromCharCode(
    48 + Math.floor(y / 1000),
    48 + (Math.floor(y / 100) % 10),
    48 + (Math.floor(y / 10) % 10),
    48 + (y % 10),
    45,
    48 + Math.floor(m / 10),
    48 + (m % 10),
    45,
    48 + Math.floor(d / 10),
    48 + (d % 10),
    84,
    48 + Math.floor(h / 10),
    48 + (h % 10),
    58,
    48 + Math.floor(mi / 10),
    48 + (mi % 10),
    58,
    48 + Math.floor(sec / 10),
    48 + (sec % 10),
    46,
    48 + Math.floor(msPart / 100),
    48 + (Math.floor(msPart / 10) % 10),
    48 + (msPart % 10),
    90,
  );
}

function digits(s: string, from: number, to: number): number {
  let v = 0;
  for (let i = from; i < to; i++) {
    const c = s.charCodeAt(i) - 48;
    if (c < 0 || c > 9) return NaN;
    v = v * 10 + c;
  }
  return to > from ? v : NaN;
}

/**
 * Parses a CCSDS time (UTC, as OMM uses it): `YYYY-MM-DDThh:mm:ss[.d…][Z]` or day-of-year `YYYY-DDDThh:mm:ss[.d…][Z]`;
 * the time part may be omitted. Returns Unix ms with the sub-millisecond fraction, or NaN.
 */
export function parseCcsdsTime(text: string): number {
  let s = text.trim();
  if (s.endsWith('Z') || s.endsWith('z')) s = s.slice(0, -1);
  const t = s.indexOf('T');
  const datePart = t >= 0 ? s.slice(0, t) : s;
  const timePart = t >= 0 ? s.slice(t + 1) : '00:00:00';
  let dayMs: number;
  if (datePart.length === 10 && datePart[4] === '-' && datePart[7] === '-') {
    const y = digits(datePart, 0, 4),
      mo = digits(datePart, 5, 7),
      d = digits(datePart, 8, 10);
    if (!(mo >= 1 && mo <= 12 && d >= 1 && d <= 31)) return NaN;
    dayMs = Date.UTC(y, mo - 1, d);
    if (new Date(dayMs).getUTCDate() !== d) return NaN;
  } else if (datePart.length === 8 && datePart[4] === '-') {
    const y = digits(datePart, 0, 4),
      doy = digits(datePart, 5, 8);
    if (!(doy >= 1 && doy <= (isLeapYear(y) ? 366 : 365))) return NaN;
    dayMs = Date.UTC(y, 0, doy);
  } else return NaN;
  if (!Number.isFinite(dayMs)) return NaN;
  if (timePart.length < 8 || timePart[2] !== ':' || timePart[5] !== ':') return NaN;
  const h = digits(timePart, 0, 2),
    mi = digits(timePart, 3, 5),
    sec = digits(timePart, 6, 8);
  if (!(h <= 23 && mi <= 59 && sec <= 60)) return NaN;
  let frac = 0;
  if (timePart.length > 8) {
    if (timePart[8] !== '.' || timePart.length === 9) return NaN;
    const fracDigits = timePart.slice(9);
    const v = digits(fracDigits, 0, Math.min(fracDigits.length, 15));
    if (!Number.isFinite(v) || (fracDigits.length > 15 && !/^\d+$/.test(fracDigits))) return NaN;
    frac = v / 10 ** Math.min(fracDigits.length, 15);
  }
  return dayMs + ((h * 60 + mi) * 60 + sec + frac) * 1000;
}
