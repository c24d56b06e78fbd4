import { z } from 'zod';
import { safeText } from './text';

/** The campaign desk's flight budget: replaced as a whole, in the order given; the goal becomes their sum. */
export const budgetLinesSchema = z.object({
  lines: z
    .array(
      z.object({
        name: safeText().trim().min(2, 'Name the budget line in at least 2 characters.').max(80, 'Keep the name under 80 characters.'),
        amountMinor: z
          .number({ message: 'Give the amount this line costs.' })
          .int('The amount is in whole minor units (cents).')
          .min(100, 'A budget line costs at least 1.00.')
          .max(100_000_000_00, 'That amount is larger than any flight budget.'),
        reason: safeText().trim().max(300, 'Keep the reason under 300 characters.').default(''),
      }),
    )
    .max(20, 'A flight budget has at most 20 lines.'),
});
export type BudgetLinesInput = z.infer<typeof budgetLinesSchema>;
