// The processor's published test card numbers (REFERENCES.md §7) and the behaviour each one stands for.

export type CardBehaviour =
  | 'succeeds'
  | 'generic_decline'
  | 'insufficient_funds'
  | 'dispute'
  /** Can be saved as the card on file, but every charge on it is declined (published test number 4000 0000 0000 0341). */
  | 'attach_then_decline';

export const testCards: Record<string, CardBehaviour> = {
  '4242424242424242': 'succeeds',
  '4000000000000002': 'generic_decline',
  '4000000000009995': 'insufficient_funds',
  '4000000000000259': 'dispute',
  '4000000000000341': 'attach_then_decline',
};

/** Test payment-method ids the processor publishes for server-side confirmation. */
export const testPaymentMethodTokens: Record<string, { behaviour: CardBehaviour; last4: string }> = {
  pm_card_visa: { behaviour: 'succeeds', last4: '4242' },
  pm_card_chargeDeclined: { behaviour: 'generic_decline', last4: '0002' },
  pm_card_chargeDeclinedInsufficientFunds: { behaviour: 'insufficient_funds', last4: '9995' },
  pm_card_createDispute: { behaviour: 'dispute', last4: '0259' },
  pm_card_chargeCustomerFail: { behaviour: 'attach_then_decline', last4: '0341' },
};

export interface Decline {
  code: 'card_declined';
  declineCode: 'generic_decline' | 'insufficient_funds';
  message: string;
}

export function declineFor(behaviour: CardBehaviour): Decline | null {
  switch (behaviour) {
    case 'generic_decline':
    case 'attach_then_decline':
      return { code: 'card_declined', declineCode: 'generic_decline', message: 'Your card was declined.' };
    case 'insufficient_funds':
      return { code: 'card_declined', declineCode: 'insufficient_funds', message: 'Your card has insufficient funds.' };
    default:
      return null;
  }
}

export function normaliseCardNumber(input: string): string {
  return input.replace(/[\s-]/g, '');
}

export interface FeeSchedule {
  /** Percentage part in basis points: 290 = 2.9 %. */
  percentBasisPoints: number;
  /** Fixed part in the charge currency's minor units: 30 = 30¢. */
  fixedMinor: number;
}

/** US card pricing, 2.9 % + 30¢ (the processor's public pricing, REFERENCES.md §7). */
export const defaultFeeSchedule: FeeSchedule = { percentBasisPoints: 290, fixedMinor: 30 };

/**
 * Fee on a charge in integer minor units. The percentage part is rounded half up to a whole minor unit
 * (5000 × 2.9 % = 145 → 175 with the fixed part; 1050 × 2.9 % = 30.45 → 30; 150 × 2.9 % = 4.35 → 4;
 * 50 × 2.9 % = 1.45 → 1; 1550 × 2.9 % = 44.95 → 45).
 */
export function cardFeeMinor(amountMinor: number, schedule: FeeSchedule = defaultFeeSchedule): number {
  if (!Number.isSafeInteger(amountMinor) || amountMinor < 0)
    throw new Error(`amountMinor must be a non-negative integer, got ${amountMinor}`);
  const percentPart = Math.floor((amountMinor * schedule.percentBasisPoints + 5000) / 10000);
  return percentPart + schedule.fixedMinor;
}
