import { z } from 'zod';
import { formatMoney } from '../../shared/money';
import type { EmailContent } from '../layout';
import { dispatchEmail, dispatchEmailSchema } from './dispatch';
import { passReminderEmail, passReminderSchema } from './pass-reminder';

const text = z
  .string()
  .trim()
  .min(1)
  .max(500)
  // Subjects are built from these values; a line break there would break the header.
  .refine((s) => !/[\u0000-\u001f\u007f]/.test(s), 'must not contain control characters or line breaks');
// Links in mail must be http(s): a javascript: or data: URL in a button would be an injection path.
const link = z.url({ protocol: /^https?$/ });
const amountMinor = z.number().int().nonnegative().refine(Number.isSafeInteger, 'must be a safe integer');
const currency = z.string().regex(/^[A-Za-z]{3}$/, 'must be a three-letter ISO 4217 code');

export const emailDataSchemas = {
  'verify-email': z.object({ displayName: text, verifyUrl: link }),
  'password-reset': z.object({
    displayName: text,
    resetUrl: link,
    expiresInMinutes: z
      .number()
      .int()
      .positive()
      .max(7 * 24 * 60),
  }),
  'pledge-confirmation': z.object({
    displayName: text,
    campaignTitle: text,
    tierTitle: text.optional(),
    amountMinor,
    currency,
    receiptUrl: link,
    /** A monthly crew membership: the confirmation says it renews, when, and how to stop it. */
    renewsMonthly: z
      .object({ nextRenewalAt: z.union([z.date(), z.iso.datetime({ offset: true })]).optional(), manageUrl: link })
      .optional(),
  }),
  'sign-up-attempt': z.object({ displayName: text, signInUrl: link, resetUrl: link }),
  'password-changed': z.object({ displayName: text, changedAt: z.union([z.date(), z.iso.datetime({ offset: true })]), resetUrl: link }),
  'renewal-failed': z.object({
    displayName: text,
    campaignTitle: text,
    amountMinor,
    currency,
    updateCardUrl: link,
    nextAttemptAt: z.union([z.date(), z.iso.datetime({ offset: true })]).optional(),
  }),
  dispatch: dispatchEmailSchema,
  'pass-reminder': passReminderSchema,
  'refund-issued': z.object({
    displayName: text,
    campaignTitle: text,
    amountMinor,
    currency,
    reason: text,
    receiptUrl: link,
  }),
} as const;

export type EmailName = keyof typeof emailDataSchemas;
export type EmailData = { [N in EmailName]: z.input<(typeof emailDataSchemas)[N]> };
type Parsed = { [N in EmailName]: z.output<(typeof emailDataSchemas)[N]> };

export const emailNames = Object.keys(emailDataSchemas) as EmailName[];

function formatWhen(value: Date | string): string {
  const date = value instanceof Date ? value : new Date(value);
  return `${new Intl.DateTimeFormat('en-GB', { dateStyle: 'long', timeStyle: 'short', timeZone: 'UTC' }).format(date)} UTC`;
}

export const emailTemplates: { [N in EmailName]: (data: Parsed[N]) => EmailContent } = {
  'verify-email': (d) => ({
    subject: 'Confirm your e-mail address for Lightkeel',
    preview: 'One click and your Lightkeel account is ready.',
    heading: `Welcome aboard, ${d.displayName}`,
    blocks: [
      {
        kind: 'paragraph',
        text: 'Please confirm that this address is yours so we can send you receipts and mission dispatches. The button confirms it and signs you in; your password works from then on.',
      },
      { kind: 'button', label: 'Confirm my address and sign in', url: d.verifyUrl },
      {
        kind: 'note',
        text: 'If you did not create a Lightkeel account, ignore this message: the account cannot be used until this link is followed.',
      },
    ],
    reason: 'You get this e-mail because this address was used to sign up for Lightkeel.',
  }),
  'password-reset': (d) => ({
    subject: 'Reset your Lightkeel password',
    preview: `This link works once and for ${d.expiresInMinutes} minutes.`,
    heading: `Hello ${d.displayName}`,
    blocks: [
      { kind: 'paragraph', text: 'Someone asked to reset the password of your Lightkeel account. Choose a new one with the button below.' },
      { kind: 'button', label: 'Choose a new password', url: d.resetUrl },
      {
        kind: 'note',
        text: `The link works once and expires in ${d.expiresInMinutes} minutes. If you did not ask for it, ignore this message: your password stays as it is.`,
      },
    ],
    reason: 'You get this e-mail because a password reset was requested for the Lightkeel account with this address.',
  }),
  'sign-up-attempt': (d) => ({
    subject: 'Someone tried to sign up to Lightkeel with your address',
    preview: 'You already have an account; nothing was changed.',
    heading: `Hello ${d.displayName}`,
    blocks: [
      {
        kind: 'paragraph',
        text: 'Someone just tried to create a Lightkeel account with this e-mail address. You already have an account, so nothing was created and nothing about your account changed.',
      },
      { kind: 'button', label: 'Sign in', url: d.signInUrl },
      {
        kind: 'note',
        text: `If it was you, sign in instead; if you forgot your password, choose a new one at ${d.resetUrl}. If it was not you, you can ignore this message.`,
      },
    ],
    reason: 'You get this e-mail because a sign-up was attempted with the address of your Lightkeel account.',
  }),
  'password-changed': (d) => ({
    subject: 'Your Lightkeel password was changed',
    preview: `Changed on ${formatWhen(d.changedAt)}.`,
    heading: `Hello ${d.displayName}`,
    blocks: [
      { kind: 'paragraph', text: `The password of your Lightkeel account was changed on ${formatWhen(d.changedAt)}.` },
      {
        kind: 'note',
        text: 'If you made this change, there is nothing more to do. If you did not, choose a new password now with the button below, and tell us.',
      },
      { kind: 'button', label: 'Choose a new password', url: d.resetUrl },
    ],
    reason: 'You get this e-mail because the password of the Lightkeel account with this address was changed.',
  }),
  'pledge-confirmation': (d) => {
    const amount = formatMoney(d.amountMinor, d.currency.toUpperCase());
    return {
      subject: `Thank you for backing ${d.campaignTitle}`,
      preview: `Your pledge of ${amount} is confirmed.`,
      heading: `Thank you, ${d.displayName}`,
      blocks: [
        { kind: 'paragraph', text: `Your pledge to ${d.campaignTitle} is confirmed. Here is what you gave:` },
        {
          kind: 'facts',
          rows: [
            { label: 'Campaign', value: d.campaignTitle },
            ...(d.tierTitle ? [{ label: 'Tier', value: d.tierTitle }] : []),
            { label: 'Amount', value: amount },
          ],
        },
        ...(d.renewsMonthly
          ? [
              {
                kind: 'paragraph' as const,
                text: d.renewsMonthly.nextRenewalAt
                  ? `This is a monthly crew membership: ${amount} renews every month. The next renewal is on ${formatWhen(d.renewsMonthly.nextRenewalAt)}. You can stop it at any time from your membership page; stop it before that date and it is not renewed.`
                  : `This is a monthly crew membership: ${amount} renews every month, a month after each payment. You can stop it at any time from your membership page; it is then not renewed.`,
              },
              { kind: 'button' as const, label: 'Manage or stop my membership', url: d.renewsMonthly.manageUrl },
            ]
          : []),
        { kind: 'button', label: 'View your receipt', url: d.receiptUrl },
        {
          kind: 'note',
          text: 'This receipt records your payment; it is not tax advice. Whether any part of a pledge can be deducted depends on where you live, so check your local rules and ask a licensed tax adviser.',
        },
      ],
      reason: `You get this e-mail because you made a pledge to ${d.campaignTitle} through Lightkeel.`,
    };
  },
  'refund-issued': (d) => {
    const amount = formatMoney(d.amountMinor, d.currency.toUpperCase());
    return {
      subject: `A refund of ${amount} from ${d.campaignTitle}`,
      preview: `We have refunded ${amount} to your card.`,
      heading: `Hello ${d.displayName}`,
      blocks: [
        {
          kind: 'paragraph',
          text: `We have sent ${amount} back to the card you paid with for ${d.campaignTitle}. Depending on your bank it shows on your statement within 5 to 10 working days.`,
        },
        {
          kind: 'facts',
          rows: [
            { label: 'Amount refunded', value: amount },
            { label: 'Reason', value: d.reason },
          ],
        },
        { kind: 'button', label: 'See your corrected receipt', url: d.receiptUrl },
        {
          kind: 'note',
          text: 'Your earlier receipt for this payment is now void and a corrected one replaces it. Receipts are not tax advice.',
        },
      ],
      reason: `You get this e-mail because a payment you made to ${d.campaignTitle} through Lightkeel was refunded.`,
    };
  },
  'renewal-failed': (d) => {
    const amount = formatMoney(d.amountMinor, d.currency.toUpperCase());
    return {
      subject: `Your monthly support for ${d.campaignTitle} could not be renewed`,
      preview: `We could not collect ${amount}. Please update your card.`,
      heading: `Hello ${d.displayName}`,
      blocks: [
        {
          kind: 'paragraph',
          text: `We tried to collect your monthly ${amount} for ${d.campaignTitle}, but the payment did not go through. Your crew membership stays active while you sort it out.`,
        },
        { kind: 'button', label: 'Update my card', url: d.updateCardUrl },
        ...(d.nextAttemptAt
          ? [{ kind: 'note' as const, text: `We will try again on ${formatWhen(d.nextAttemptAt)}.` }]
          : [{ kind: 'note' as const, text: 'We will not try again until you update your card.' }]),
      ],
      reason: `You get this e-mail because you hold a monthly crew membership for ${d.campaignTitle}.`,
    };
  },
  dispatch: dispatchEmail,
  'pass-reminder': passReminderEmail,
};
