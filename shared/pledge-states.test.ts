import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { canMove, moneyStateOf, nextPledgeState, pledgeTransitions, type PledgeFact } from './pledge-states';
import { pledgeStates, type PledgeState } from './schemas/campaign';

type Happening =
  { kind: 'declined' } | { kind: 'closed' } | { kind: 'charge'; minor: number } | { kind: 'refund'; minor: number } | { kind: 'dispute' };

/** Applies happenings in the given order the way the webhook does: ledger facts re-derive the money state from the whole ledger. */
function run(order: Happening[]) {
  let state: PledgeState = 'started';
  const ledger = { chargedMinor: 0, refundedMinor: 0, disputes: 0 };
  const moves: [PledgeState, PledgeState][] = [];
  for (const h of order) {
    let fact: PledgeFact | null;
    if (h.kind === 'declined' || h.kind === 'closed') fact = h;
    else {
      if (h.kind === 'charge') ledger.chargedMinor += h.minor;
      if (h.kind === 'refund') ledger.refundedMinor += h.minor;
      if (h.kind === 'dispute') ledger.disputes += 1;
      const money = moneyStateOf(ledger);
      fact = money ? { kind: 'money', state: money } : null;
    }
    if (!fact) continue;
    const next = nextPledgeState(state, fact);
    moves.push([state, next]);
    state = next;
  }
  return { state, moves };
}

const happening = fc.oneof(
  fc.constant<Happening>({ kind: 'declined' }),
  fc.constant<Happening>({ kind: 'closed' }),
  fc.integer({ min: 1, max: 10_000 }).map((minor): Happening => ({ kind: 'charge', minor })),
  fc.integer({ min: 1, max: 10_000 }).map((minor): Happening => ({ kind: 'refund', minor })),
  fc.constant<Happening>({ kind: 'dispute' }),
);

describe('the pledge state machine', () => {
  it('ends in the same state for every order of the same happenings', () => {
    fc.assert(
      fc.property(
        fc.array(happening, { maxLength: 8 }).chain((hs) => fc.tuple(fc.constant(hs), fc.shuffledSubarray(hs, { minLength: hs.length }))),
        ([given, shuffled]) => {
          expect(run(shuffled).state).toBe(run(given).state);
        },
      ),
      { numRuns: 2000 },
    );
  });

  it('only ever moves along the transition table', () => {
    fc.assert(
      fc.property(fc.array(happening, { maxLength: 10 }), (hs) => {
        for (const [from, to] of run(hs).moves) expect(canMove(from, to)).toBe(true);
      }),
    );
  });

  it('ends abandoned for a decline and an expiry in either order, and a late payment still wins', () => {
    expect(run([{ kind: 'declined' }, { kind: 'closed' }]).state).toBe('abandoned');
    expect(run([{ kind: 'closed' }, { kind: 'declined' }]).state).toBe('abandoned');
    expect(run([{ kind: 'closed' }, { kind: 'charge', minor: 500 }]).state).toBe('paid');
  });

  it('lists every state, and a disputed pledge leaves only by its ledger', () => {
    expect(Object.keys(pledgeTransitions).sort()).toEqual([...pledgeStates].sort());
    expect(pledgeTransitions.disputed).toEqual([]);
    expect(nextPledgeState('paid', { kind: 'declined' })).toBe('paid');
    expect(nextPledgeState('abandoned', { kind: 'declined' })).toBe('abandoned');
  });
});
