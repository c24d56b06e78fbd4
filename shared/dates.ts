// One date format for the whole product's orbit pages, text and inputs alike: year-month-day, UTC (ISO 8601 order),
// so what an input shows reads the same as the text beside it.

const pad = (n: number) => String(n).padStart(2, '0');

export function formatUtcDate(ms: number): string {
  const d = new Date(ms);
  return `${d.getUTCFullYear()}-${pad(d.getUTCMonth() + 1)}-${pad(d.getUTCDate())}`;
}

export function formatUtcDateTime(ms: number): string {
  const d = new Date(ms);
  return `${formatUtcDate(ms)} ${pad(d.getUTCHours())}:${pad(d.getUTCMinutes())} UTC`;
}
