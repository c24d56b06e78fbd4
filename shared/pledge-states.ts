// The pledge state machine, in one place. Facts reach a pledge in any order (the processor retries and
// reorders webhooks), so a state is never "the last event seen": facts without money have a precedence, and
// money states are derived from the ledger as a whole. Then the final state depends only on which facts
// arrived, never on their order (tests/api/pledges-event-order.test.ts replays every order).
import type { PledgeState } from './schemas/campaign';

export const moneyStates = ['paid', 'partly_refunded', 'refunded', 'disputed'] as const satisfies readonly PledgeState[];
export type MoneyState = (typeof moneyStates)[number];

/**
 * What happened to a pledge.
 * - declined: a payment attempt was declined (the checkout stays open and may be retried);
 * - closed: the checkout closed without payment (expired, or the backer left it);
 * - money: the ledger changed; `state` is derived from the whole ledger by `moneyStateOf`.
 */
export type PledgeFact = { kind: 'declined' } | { kind: 'closed' } | { kind: 'money'; state: MoneyState };

/**
 * Precedence of the states without money: a fact of lower rank arriving after one of higher rank changes
 * nothing. A closed checkout outranks a decline (a decline is retryable, a closed checkout is final), so a
 * declined payment whose checkout expired ends `abandoned` whichever event comes first.
 */
export const pledgeStatePrecedence: Record<Exclude<PledgeState, MoneyState>, number> = {
  started: 0,
  failed: 1,
  abandoned: 2,
};

/**
 * Every allowed move (a state may also stay where it is). Money outranks every state without money: an
 * expired checkout can still be paid late. Among money states the ledger decides: refunds and disputes only
 * accumulate, but a later membership charge can turn `refunded` into `partly_refunded`.
 */
export const pledgeTransitions: Record<PledgeState, readonly PledgeState[]> = {
  started: ['failed', 'abandoned', 'paid', 'partly_refunded', 'refunded', 'disputed'],
  failed: ['abandoned', 'paid', 'partly_refunded', 'refunded', 'disputed'],
  abandoned: ['paid', 'partly_refunded', 'refunded', 'disputed'],
  paid: ['partly_refunded', 'refunded', 'disputed'],
  partly_refunded: ['refunded', 'disputed'],
  refunded: ['partly_refunded', 'disputed'],
  disputed: [],
};

export const isMoneyState = (s: PledgeState): s is MoneyState => (moneyStates as readonly PledgeState[]).includes(s);

export const canMove = (from: PledgeState, to: PledgeState) => from === to || pledgeTransitions[from].includes(to);

/** The state a fact leads to from `current`; `current` itself when the fact does not outrank it. */
export function nextPledgeState(current: PledgeState, fact: PledgeFact): PledgeState {
  const proposed: PledgeState = fact.kind === 'money' ? fact.state : fact.kind === 'declined' ? 'failed' : 'abandoned';
  return canMove(current, proposed) ? proposed : current;
}

/** The money state of a ledger: disputed > refunded > partly refunded > paid; null while nothing was charged. */
export function moneyStateOf(totals: { chargedMinor: number; refundedMinor: number; disputes: number }): MoneyState | null {
  if (totals.chargedMinor <= 0) return null;
  if (totals.disputes > 0) return 'disputed';
  if (totals.refundedMinor >= totals.chargedMinor) return 'refunded';
  if (totals.refundedMinor > 0) return 'partly_refunded';
  return 'paid';
}
