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

export function msToIso(ms: number): string {
  return new Date(Math.round(ms)).toISOString();
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
    const y = digits(datePart, 0, 4), mo = digits(datePart, 5, 7), d = digits(datePart, 8, 10);
    if (!(mo >= 1 && mo <= 12 && d >= 1 && d <= 31)) return NaN;
    dayMs = Date.UTC(y, mo - 1, d);
    if (new Date(dayMs).getUTCDate() !== d) return NaN;
  } else if (datePart.length === 8 && datePart[4] === '-') {
    const y = digits(datePart, 0, 4), doy = digits(datePart, 5, 8);
    if (!(doy >= 1 && doy <= (isLeapYear(y) ? 366 : 365))) return NaN;
    dayMs = Date.UTC(y, 0, doy);
  } else return NaN;
  if (!Number.isFinite(dayMs)) return NaN;
  if (timePart.length < 8 || timePart[2] !== ':' || timePart[5] !== ':') return NaN;
  const h = digits(timePart, 0, 2), mi = digits(timePart, 3, 5), sec = digits(timePart, 6, 8);
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
