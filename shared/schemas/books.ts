import { z } from 'zod';
import { safeText } from './text';

export const refundReasons = ['backer_asked', 'duplicate', 'fraudulent', 'goodwill'] as const;
export type RefundReason = (typeof refundReasons)[number];

export const createRefundSchema = z.object({
  amountMinor: z.coerce.number().int().positive({ message: 'must be a positive whole number of minor units' }),
  reason: z.enum(refundReasons, { message: `must be one of ${refundReasons.join(', ')}` }),
  note: safeText({ multiline: true }).trim().max(500, { message: 'at most 500 characters' }).default(''),
  /** Which charge of the pledge (a crew membership has one per month); default: the latest. */
  chargeId: z
    .string()
    .regex(/^ch_[A-Za-z0-9]+$/, { message: 'must be a processor charge id (ch_…)' })
    .optional(),
});
export type CreateRefundInput = z.infer<typeof createRefundSchema>;

export const booksSettingsSchema = z.object({
  organisationName: safeText().trim().min(1, { message: 'is required' }).max(200),
  address: safeText({ multiline: true }).trim().min(1, { message: 'is required' }).max(1000),
  registrationNumber: safeText().trim().min(1, { message: 'is required' }).max(100),
});
export type BooksSettingsInput = z.infer<typeof booksSettingsSchema>;

const isoDay = z.iso.date({ message: 'must be a date YYYY-MM-DD' });
export const startReconciliationSchema = z
  .object({ from: isoDay, to: isoDay })
  .refine((v) => v.from <= v.to, { message: 'must not be after "to"', path: ['from'] });
export type StartReconciliationInput = z.infer<typeof startReconciliationSchema>;

export const resolveFindingSchema = z.object({
  action: z.enum(['record_from_processor', 'acknowledge'], { message: 'must be record_from_processor or acknowledge' }),
  note: safeText({ multiline: true }).trim().max(500).default(''),
});
export type ResolveFindingInput = z.infer<typeof resolveFindingSchema>;

export const monthParamSchema = z.object({
  month: z.string().regex(/^\d{4}-(0[1-9]|1[0-2])$/, { message: 'must be a month YYYY-MM' }),
});

export const findingKinds = [
  'missing_in_ledger',
  'missing_at_processor',
  'amount_mismatch',
  'currency_mismatch',
  'fee_mismatch',
  'double_charge',
  'payout_differs',
  'payout_sums',
] as const;
export type FindingKind = (typeof findingKinds)[number];
/** Findings that stand in the way of a month close until resolved. */
export const blockingFindingKinds: FindingKind[] = findingKinds.filter((k) => k !== 'payout_sums');

/** One currency's money in a month's close report, in minor units. */
export type CurrencyTotals = {
  currency: string;
  chargesMinor: number;
  feesMinor: number;
  refundsMinor: number;
  disputesMinor: number;
  disputeReversalsMinor: number;
  payoutsMinor: number;
  netMinor: number;
};

/** A month's close report: frozen at close, computed live while the month is open. */
export type MonthReport = {
  month: string;
  totals: CurrencyTotals[];
  byTier: { campaignTitle: string; tierTitle: string; currency: string; count: number; amountMinor: number }[];
  /** Entries booked into this month that happened in an earlier, closed month (e.g. a later refund). */
  lateEntries: {
    entryId: number;
    kind: string;
    amountMinor: number;
    currency: string;
    occurredMonth: string;
    processorChargeId: string | null;
  }[];
  payouts: { processorObjectId: string; amountMinor: number; currency: string; occurredAt: string }[];
};
export type MonthReportView = { month: string; closed: { at: string; runId: string } | null; report: MonthReport };

/** Refund reasons in words, for people. */
export const refundReasonWords: Record<RefundReason, string> = {
  backer_asked: 'The backer asked',
  duplicate: 'Paid twice',
  fraudulent: 'Fraudulent payment',
  goodwill: 'Goodwill',
};
