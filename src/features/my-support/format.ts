import type { PledgeState } from '@shared/schemas/campaign';

export { money } from '@/lib/money';
export const dateFormat = new Intl.DateTimeFormat('en-GB', { dateStyle: 'medium' });
export const dateTimeFormat = new Intl.DateTimeFormat('en-GB', { dateStyle: 'long', timeStyle: 'short' });

export const stateTone = (s: PledgeState): 'good' | 'attention' | 'neutral' =>
  s === 'paid' ? 'good' : s === 'failed' || s === 'disputed' ? 'attention' : 'neutral';

export const membershipLabels: Record<string, string> = {
  active: 'Active',
  past_due: 'Payment due',
  unpaid: 'Unpaid',
  canceled: 'Ended',
  incomplete: 'Starting',
  trialing: 'Active',
  paused: 'Paused',
};
