import { z } from 'zod';
import type { FilledBudgetLine } from '../flight-budget';
import { NO_GIFT_LABEL, PLEDGE_MAX_MINOR, PLEDGE_MIN_MINOR, SAIL_ROLL_LABEL } from '../campaign-words';
import { safeText } from './text';

// Inputs and views of campaigns, tiers, stretch targets and pledges, shared by forms and the server.
// Money is always integer minor units with an ISO 4217 currency.

const minor = (label: string) =>
  z
    .number({ message: `${label} must be a whole number of minor units (cents)` })
    .int({ message: `${label} must be a whole number of minor units (cents)` })
    .refine(Number.isSafeInteger, `${label} is too large`);

export const currencySchema = safeText()
  .trim()
  .regex(/^[A-Za-z]{3}$/, 'must be a three-letter ISO 4217 code')
  .transform((c) => c.toUpperCase());

export { PLEDGE_MIN_MINOR, PLEDGE_MAX_MINOR };

export const tierKinds = ['one-time', 'monthly'] as const;
export const tierKindSchema = z.enum(tierKinds);
export type TierKind = z.infer<typeof tierKindSchema>;

export const pledgeStates = ['started', 'paid', 'partly_refunded', 'refunded', 'disputed', 'failed', 'abandoned'] as const;
export type PledgeState = (typeof pledgeStates)[number];

const isoDateTime = z.iso.datetime({ offset: true, message: 'must be an ISO date-time such as 2027-03-01T00:00:00Z' });

export const updateCampaignSchema = z
  .object({
    title: safeText().trim().min(3, 'Give the campaign a title of at least 3 characters').max(120),
    summary: safeText({ multiline: true }).trim().max(300).default(''),
    story: safeText({ multiline: true }).trim().max(20_000).default(''),
    goalMinor: minor('The goal').min(100, 'The goal must be at least 100 minor units').max(10_000_000_000),
    currency: currencySchema,
    startsAt: isoDateTime,
    endsAt: isoDateTime,
  })
  .refine((c) => Date.parse(c.endsAt) > Date.parse(c.startsAt), { path: ['endsAt'], message: 'The end must come after the start' });
export type UpdateCampaignInput = z.infer<typeof updateCampaignSchema>;

export const tierInputSchema = z.object({
  title: safeText().trim().min(2, 'Give the tier a title').max(80),
  description: safeText({ multiline: true }).trim().max(2000).default(''),
  minAmountMinor: minor('The minimum amount')
    .min(PLEDGE_MIN_MINOR, `The minimum amount must be at least ${PLEDGE_MIN_MINOR} minor units`)
    .max(PLEDGE_MAX_MINOR),
  kind: tierKindSchema,
  quantityLimit: z.number().int().min(1, 'A limit must be at least 1').max(1_000_000).nullable().default(null),
  estimatedDelivery: z.iso.date({ message: 'must be a date such as 2027-06-01' }).nullable().default(null),
  position: z.number().int().min(0).max(1000).default(0),
  active: z.boolean().default(true),
});
export type TierInput = z.infer<typeof tierInputSchema>;

export const stretchTargetsSchema = z.object({
  targets: z
    .array(
      z.object({
        amountMinor: minor('The target amount').min(1),
        title: safeText().trim().min(2).max(120),
        description: safeText({ multiline: true }).trim().max(1000).default(''),
      }),
    )
    .max(20),
});
export type StretchTargetsInput = z.infer<typeof stretchTargetsSchema>;

export const createPledgeSchema = z.object({
  campaignSlug: safeText().trim().min(1).max(80),
  tierId: z.uuid({ message: 'must be a tier id' }).nullable().default(null),
  amountMinor: minor('The amount')
    .min(PLEDGE_MIN_MINOR, `The smallest pledge is ${PLEDGE_MIN_MINOR} minor units`)
    .max(PLEDGE_MAX_MINOR, `The largest pledge is ${PLEDGE_MAX_MINOR} minor units`),
  anonymous: z.boolean().default(false),
  publicName: safeText().trim().max(60, 'Keep the public name to 60 characters').optional(),
  message: safeText({ multiline: true }).trim().max(500, 'Keep the message to 500 characters').optional(),
  /** One key per attempt, made by the client: a repeated submit of the same attempt returns the same pledge. */
  attemptKey: z.uuid({ message: 'must be a UUID made for this attempt' }),
});
export type CreatePledgeInput = z.infer<typeof createPledgeSchema>;

/** "Try again" on a failed or abandoned pledge: a fresh attempt for the same gift and amount. */
export const retryPledgeSchema = z.object({
  attemptKey: z.uuid({ message: 'must be a UUID made for this attempt' }),
});
export type RetryPledgeInput = z.infer<typeof retryPledgeSchema>;

export const emailPreferencesSchema = z.object({
  dispatches: z.boolean(),
  receipts: z.boolean(),
  membership: z.boolean(),
});
export type EmailPreferences = z.infer<typeof emailPreferencesSchema>;

export const deleteAccountSchema = z.object({
  confirmEmail: safeText().trim().min(1, 'Type your e-mail address to confirm').max(254),
});
export type DeleteAccountInput = z.infer<typeof deleteAccountSchema>;

// ---- views (what the API answers) ----

export type TierView = {
  id: string;
  title: string;
  description: string;
  minAmountMinor: number;
  kind: TierKind;
  quantityLimit: number | null;
  /** null when unlimited */
  remaining: number | null;
  soldOut: boolean;
  estimatedDelivery: string | null;
  position: number;
  active: boolean;
};

export type StretchTargetView = { id: string; amountMinor: number; title: string; description: string; reached: boolean };

export type CampaignProgress = {
  raisedMinor: number;
  goalMinor: number;
  currency: string;
  backers: number;
  /** Whole percent of the goal raised, may pass 100. */
  percent: number;
  status: 'upcoming' | 'open' | 'ended';
  secondsLeft: number;
  asOf: string;
};

export type CampaignView = {
  id: string;
  slug: string;
  title: string;
  summary: string;
  story: string;
  goalMinor: number;
  currency: string;
  startsAt: string;
  endsAt: string;
  tiers: TierView[];
  stretchTargets: StretchTargetView[];
  /** The flight budget filled in order by the money raised; empty when outreach has set no lines. */
  budgetLines: FilledBudgetLine[];
  progress: CampaignProgress;
};

export type PledgeView = {
  id: string;
  campaign: { slug: string; title: string };
  tier: { id: string; title: string } | null;
  kind: TierKind;
  amountMinor: number;
  currency: string;
  state: PledgeState;
  failureReason: string | null;
  /** Set when a payment attempt was declined (the reason is then the decline's). */
  declined: boolean;
  publicName: string | null;
  message: string | null;
  paidMinor: number;
  refundedMinor: number;
  createdAt: string;
  paidAt: string | null;
  checkoutUrl: string | null;
};

export type PaymentView = {
  id: number;
  kind: 'charge' | 'refund' | 'dispute';
  amountMinor: number;
  currency: string;
  occurredAt: string;
  processorId: string;
};

export type MembershipView = {
  id: string;
  pledgeId: string;
  tier: { id: string; title: string } | null;
  campaign: { slug: string; title: string };
  amountMinor: number;
  currency: string;
  status: string;
  currentPeriodEnd: string | null;
  cancelAtPeriodEnd: boolean;
  endedAt: string | null;
};

export type ReceiptView = {
  number: string;
  entryId: number;
  kind: 'charge' | 'refund';
  amountMinor: number;
  currency: string;
  occurredAt: string;
  processorId: string;
  backerName: string;
  campaign: { slug: string; title: string };
  tier: string | null;
  pledgeId: string;
  pledgeKind: TierKind;
};

export { NO_GIFT_LABEL, SAIL_ROLL_LABEL };
