// Money is integer minor units plus an ISO 4217 code; the number of minor digits comes from Intl
// (JPY 0, USD 2, BHD 3) so no currency table is kept here.

export class MoneyError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'MoneyError';
  }
}

function assertCurrency(currency: string): string {
  const code = typeof currency === 'string' ? currency.trim().toUpperCase() : '';
  if (!/^[A-Z]{3}$/.test(code)) {
    throw new MoneyError(`currency must be a three-letter ISO 4217 code, got ${JSON.stringify(currency)}`);
  }
  try {
    new Intl.NumberFormat('en', { style: 'currency', currency: code });
  } catch {
    throw new MoneyError(`currency ${code} is not known to Intl`);
  }
  return code;
}

function assertMinorUnits(amountMinor: number): void {
  if (!Number.isSafeInteger(amountMinor)) {
    throw new MoneyError(`amountMinor must be a safe integer number of minor units, got ${String(amountMinor)}`);
  }
}

/** Digits after the decimal point for a currency, e.g. 2 for USD, 0 for JPY, 3 for KWD. */
export function currencyExponent(currency: string): number {
  const code = assertCurrency(currency);
  return new Intl.NumberFormat('en', { style: 'currency', currency: code }).resolvedOptions().maximumFractionDigits ?? 2;
}

/** Exact decimal string of an amount in major units ("1234.50"), built from digits, never from a float. */
export function minorToDecimalString(amountMinor: number, currency: string): string {
  assertMinorUnits(amountMinor);
  const exponent = currencyExponent(currency);
  const negative = amountMinor < 0;
  const digits = String(Math.abs(amountMinor)).padStart(exponent + 1, '0');
  const whole = digits.slice(0, digits.length - exponent);
  const fraction = digits.slice(digits.length - exponent);
  return `${negative ? '-' : ''}${whole}${exponent > 0 ? `.${fraction}` : ''}`;
}

/** Formats integer minor units for people, e.g. formatMoney(123450, 'EUR') → "€1,234.50". */
export function formatMoney(amountMinor: number, currency: string, locale = 'en-GB'): string {
  const code = assertCurrency(currency);
  const decimal = minorToDecimalString(amountMinor, code);
  const formatter = new Intl.NumberFormat(locale, { style: 'currency', currency: code });
  // Intl accepts exact decimal strings (ES2023 NumberFormat v3); the cast covers older lib typings.
  return formatter.format(decimal as unknown as number);
}
