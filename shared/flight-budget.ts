// The flight budget: the campaign's goal as budget lines, filled in order by the money raised. Pure; minor units.

export type BudgetLine = { id: string; name: string; amountMinor: number; reason: string };
export type BudgetLineState = 'paid' | 'filling' | 'waiting';
export type FilledBudgetLine = BudgetLine & { fundedMinor: number; state: BudgetLineState };

/**
 * Pours `raisedMinor` into the lines in order: each line takes what it needs before the next gets anything.
 * Exactly one line is 'filling' while money is short of the total (the one the next pledge pays for).
 */
export function fillBudget(lines: readonly BudgetLine[], raisedMinor: number): FilledBudgetLine[] {
  let left = Math.max(0, Math.trunc(raisedMinor));
  let fillingGiven = false;
  return lines.map((line) => {
    const fundedMinor = Math.min(line.amountMinor, left);
    left -= fundedMinor;
    let state: BudgetLineState;
    if (fundedMinor === line.amountMinor) state = 'paid';
    else if (!fillingGiven) {
      state = 'filling';
      fillingGiven = true;
    } else state = 'waiting';
    return { ...line, fundedMinor, state };
  });
}

export function budgetTotalMinor(lines: readonly { amountMinor: number }[]): number {
  return lines.reduce((sum, l) => sum + l.amountMinor, 0);
}
