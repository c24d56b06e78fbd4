import { formatUtcDate } from '@shared/dates';

// Dates in the orbit desk are UTC, as element-set epochs are, and read year-month-day in text and inputs alike.
export { formatUtcDate, formatUtcDateTime } from '@shared/dates';

/** The value a date input shows: the same yyyy-mm-dd the text uses. */
export function toDateInput(ms: number): string {
  return formatUtcDate(ms);
}

/** A yyyy-mm-dd input value as the start (or end) of that UTC day. */
export function fromDateInput(value: string, endOfDay = false): number | null {
  const v = value.trim();
  if (!/^\d{4}-\d{2}-\d{2}$/.test(v)) return null;
  const ms = Date.parse(`${v}T00:00:00Z`);
  return Number.isFinite(ms) ? ms + (endOfDay ? 86_400_000 - 1 : 0) : null;
}

/** "2026-02-01 14:00" (UTC) for a date-and-time input, the way the text writes it without "UTC". */
export function toDateTimeInput(iso: string): string {
  return `${iso.slice(0, 10)} ${iso.slice(11, 16)}`;
}

/** A "yyyy-mm-dd hh:mm" (or "yyyy-mm-dd") input as an ISO instant in UTC, or null when it is not one. */
export function fromDateTimeInput(value: string): string | null {
  const m = /^(\d{4}-\d{2}-\d{2})(?:[ T](\d{2}):(\d{2}))?$/.exec(value.trim());
  if (!m) return null;
  const iso = `${m[1]}T${m[2] ?? '00'}:${m[3] ?? '00'}:00Z`;
  const ms = Date.parse(iso);
  return Number.isFinite(ms) && new Date(ms).toISOString().slice(0, 16) === iso.slice(0, 16) ? iso : null;
}

export const DATE_HINT = 'yyyy-mm-dd, UTC';
export const DATE_TIME_HINT = 'yyyy-mm-dd hh:mm, UTC';

export function signed(value: number, digits: number): string {
  const s = value.toFixed(digits);
  return value > 0 && Number(s) !== 0 ? `+${s}` : s;
}

/** Scientific notation with a proper superscript-free form, e.g. 3.2 × 10⁻⁶. */
export function sci(value: number | null | undefined, digits = 2): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—';
  if (value === 0) return '0';
  const exp = Math.floor(Math.log10(Math.abs(value)));
  const mant = value / 10 ** exp;
  const sup = String(exp)
    .replace(/-/g, '⁻')
    .replace(/\d/g, (d) => '⁰¹²³⁴⁵⁶⁷⁸⁹'[Number(d)]!);
  return `${mant.toFixed(digits)} × 10${sup}`;
}

export const sailModeLabels = { raising: 'Raising', 'edge-on': 'Edge-on', tumbling: 'Tumbling', unknown: 'Unknown' } as const;

/** "1 set", "2 sets", "1,198 sets". */
export function countOf(n: number, one: string, many = `${one}s`): string {
  return `${n.toLocaleString('en-GB')} ${n === 1 ? one : many}`;
}
