import { formatMoney } from '@shared/money';

/** Amounts as the web app shows them everywhere. */
export const money = (amountMinor: number, currency: string) => formatMoney(amountMinor, currency, 'en-US');
