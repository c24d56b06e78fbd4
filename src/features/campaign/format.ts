export { money } from '@/lib/money';

/** "12 days", "5 hours"; the label next to it says whether that is left or until opening. */
export function timeLeft(secondsLeft: number, status: 'upcoming' | 'open' | 'ended'): string {
  if (status === 'ended' || secondsLeft <= 0) return 'Ended';
  const days = Math.floor(secondsLeft / 86_400);
  if (days >= 2) return `${days} days`;
  const hours = Math.max(1, Math.floor(secondsLeft / 3600));
  return `${hours} hour${hours === 1 ? '' : 's'}`;
}

export const longDate = new Intl.DateTimeFormat('en-GB', { dateStyle: 'long', timeZone: 'UTC' });
export const monthYear = new Intl.DateTimeFormat('en-GB', { month: 'long', year: 'numeric', timeZone: 'UTC' });

/** Typed major units ("48000", "35.50") → integer minor units, built from the digits. */
export function parseMajor(text: string, exponent = 2): number | null {
  const m = (exponent > 0 ? new RegExp(`^(\\d{1,10})(?:\\.(\\d{1,${exponent}}))?$`) : /^(\d{1,12})()$/).exec(text.trim().replace(/,/g, ''));
  if (!m) return null;
  const minor = Number(m[1]) * 10 ** exponent + Number((m[2] ?? '').padEnd(exponent, '0') || 0);
  return Number.isSafeInteger(minor) ? minor : null;
}

export function minorToMajorText(amountMinor: number, exponent = 2): string {
  const s = String(amountMinor).padStart(exponent + 1, '0');
  const frac = s.slice(s.length - exponent);
  return exponent === 0 || /^0+$/.test(frac) ? s.slice(0, s.length - exponent) : `${s.slice(0, s.length - exponent)}.${frac}`;
}

/** A stored UTC time as the datetime-local input shows it (minutes). */
export const toLocalInput = (iso: string) => iso.slice(0, 16);

/** The form shows minutes only: a time the user did not touch goes back as stored, seconds included. */
export const fromLocalInput = (local: string, stored: string) => (local === toLocalInput(stored) ? stored : `${local}:00Z`);
