import { formatMoney } from '@shared/money';
import type { PledgeState } from '@shared/schemas/campaign';

export const money = (amountMinor: number, currency: string) => formatMoney(amountMinor, currency, 'en-US');
export const dateFormat = new Intl.DateTimeFormat('en-GB', { dateStyle: 'medium' });
export const dateTimeFormat = new Intl.DateTimeFormat('en-GB', { dateStyle: 'long', timeStyle: 'short' });

export const stateLabels: Record<PledgeState, string> = {
  started: 'Waiting for payment',
  paid: 'Paid',
  partly_refunded: 'Partly refunded',
  refunded: 'Refunded',
  disputed: 'Disputed',
  failed: 'Not paid',
  abandoned: 'Cancelled',
};

export const stateTone = (s: PledgeState): 'good' | 'attention' | 'neutral' => (s === 'paid' ? 'good' : s === 'failed' || s === 'disputed' ? 'attention' : 'neutral');

export const membershipLabels: Record<string, string> = {
  active: 'Active',
  past_due: 'Payment due',
  unpaid: 'Unpaid',
  canceled: 'Ended',
  incomplete: 'Starting',
  trialing: 'Active',
  paused: 'Paused',
};
