import { formatMoney } from '@shared/money';

export const money = (amountMinor: number, currency: string) => formatMoney(amountMinor, currency, 'en-US');

/** "12 days left", "5 hours left", "ended". */
export function timeLeft(secondsLeft: number, status: 'upcoming' | 'open' | 'ended'): string {
  if (status === 'ended' || secondsLeft <= 0) return 'Ended';
  const days = Math.floor(secondsLeft / 86_400);
  if (days >= 2) return `${days} days ${status === 'upcoming' ? 'to run' : 'left'}`;
  const hours = Math.max(1, Math.floor(secondsLeft / 3600));
  return `${hours} hour${hours === 1 ? '' : 's'} ${status === 'upcoming' ? 'to run' : 'left'}`;
}

export const longDate = new Intl.DateTimeFormat('en-GB', { dateStyle: 'long', timeZone: 'UTC' });
export const monthYear = new Intl.DateTimeFormat('en-GB', { month: 'long', year: 'numeric', timeZone: 'UTC' });
