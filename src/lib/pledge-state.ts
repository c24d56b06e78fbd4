import type { PledgeState } from '@shared/schemas/campaign';

export const pledgeStateLabels: Record<PledgeState, string> = {
  started: 'Waiting for payment',
  paid: 'Paid',
  partly_refunded: 'Partly refunded',
  refunded: 'Refunded',
  disputed: 'Disputed',
  failed: 'Not paid',
  abandoned: 'Cancelled',
};
