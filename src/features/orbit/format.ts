const MONTHS = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec'];

/** Dates in the orbit desk are UTC, as element-set epochs are. */
export function formatUtcDate(ms: number): string {
  const d = new Date(ms);
  return `${d.getUTCDate()} ${MONTHS[d.getUTCMonth()]} ${d.getUTCFullYear()}`;
}

export function formatUtcDateTime(ms: number): string {
  const d = new Date(ms);
  return `${formatUtcDate(ms)} ${String(d.getUTCHours()).padStart(2, '0')}:${String(d.getUTCMinutes()).padStart(2, '0')} UTC`;
}

export function toDateInput(ms: number): string {
  return new Date(ms).toISOString().slice(0, 10);
}

/** A yyyy-mm-dd input value as the start (or end) of that UTC day. */
export function fromDateInput(value: string, endOfDay = false): number | null {
  if (!/^\d{4}-\d{2}-\d{2}$/.test(value)) return null;
  const ms = Date.parse(`${value}T00:00:00Z`);
  return Number.isFinite(ms) ? ms + (endOfDay ? 86_400_000 - 1 : 0) : null;
}

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
