import { currencyExponent } from '@shared/money';

export { money } from '@/lib/money';

/** Typed major units ("35", "35.50", "1,200") → integer minor units, from the digits, never through a float. */
export function parseAmountToMinor(text: string, currency: string): { minor: number } | { error: string } {
  const exponent = currencyExponent(currency);
  const cleaned = text
    .trim()
    .replace(/^[$€£]/, '')
    .replace(/,/g, '');
  const re = exponent > 0 ? new RegExp(`^(\\d{1,9})(?:\\.(\\d{1,${exponent}}))?$`) : /^(\d{1,12})()$/;
  const m = re.exec(cleaned);
  if (!m) return { error: exponent > 0 ? `Enter an amount such as 35 or 35.50` : 'Enter a whole amount' };
  const minor = Number(m[1]) * 10 ** exponent + Number((m[2] ?? '').padEnd(exponent, '0') || 0);
  return Number.isSafeInteger(minor) ? { minor } : { error: 'That amount is too large' };
}

export function minorToInput(amountMinor: number, currency: string): string {
  const exponent = currencyExponent(currency);
  const s = String(amountMinor).padStart(exponent + 1, '0');
  const whole = s.slice(0, s.length - exponent);
  const frac = s.slice(s.length - exponent);
  return exponent === 0 || /^0+$/.test(frac) ? whole : `${whole}.${frac}`;
}
