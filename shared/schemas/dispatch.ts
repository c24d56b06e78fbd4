import { z } from 'zod';
import { safeText } from './text';

// Dispatches: one schema per input, shared by the desk's forms and the API's validator.

export const dispatchStates = ['draft', 'scheduled', 'published', 'withdrawn'] as const;
export type DispatchState = (typeof dispatchStates)[number];

export const audienceKinds = ['everyone', 'backers', 'tiers', 'crew'] as const;
export type AudienceKind = (typeof audienceKinds)[number];

export const AUDIENCE_LABEL: Record<AudienceKind, string> = {
  everyone: 'Everyone',
  backers: 'All backers',
  tiers: 'Backers of chosen tiers',
  crew: 'Crew members',
};

export const DISPATCH_STATE_LABEL: Record<DispatchState, string> = {
  draft: 'Draft',
  scheduled: 'Scheduled',
  published: 'Published',
  withdrawn: 'Withdrawn',
};

/** The only moves a dispatch may make; anything else is refused with the allowed list. */
export const DISPATCH_TRANSITIONS: Record<DispatchState, readonly DispatchState[]> = {
  draft: ['scheduled', 'published'],
  scheduled: ['draft', 'published'],
  published: ['withdrawn'],
  withdrawn: ['published'],
};

export const DISPATCH_TITLE_MAX = 160;
export const DISPATCH_BODY_MAX = 50_000;
export const DISPATCH_CHARTS_MAX = 3;

const title = safeText()
  .trim()
  .min(1, 'Give the dispatch a title')
  .max(DISPATCH_TITLE_MAX, `Keep the title under ${DISPATCH_TITLE_MAX} characters`)
  // The title becomes an e-mail subject: a line break there would break the header.
  .refine((s) => !/[\u0000-\u001f\u007f]/.test(s), 'The title must be one line without control characters');

const bodyMarkdown = safeText({ multiline: true }).max(
  DISPATCH_BODY_MAX,
  `Keep the body under ${DISPATCH_BODY_MAX.toLocaleString('en')} characters`,
);

const chart = z.object({
  snapshotId: z.uuid({ message: 'must be a snapshot id' }),
  alt: safeText().trim().min(1, 'Describe the chart for readers who cannot see it').max(300),
});

const audience = z
  .object({
    kind: z.enum(audienceKinds, { message: 'Choose who the dispatch is for' }),
    tierIds: z
      .array(z.uuid({ message: 'must be a tier id' }))
      .max(50)
      .default([]),
  })
  .superRefine((a, ctx) => {
    if (a.kind === 'tiers' && a.tierIds.length === 0)
      ctx.addIssue({ code: 'custom', path: ['tierIds'], message: 'Choose at least one tier' });
  });

/** The image types a hero image may be; the server sniffs the bytes, the browser's claim only helps the form. */
export const HERO_IMAGE_TYPES = ['image/png', 'image/jpeg', 'image/webp', 'image/gif'] as const;

/** The hero image's description: required with every upload, since the image says nothing to a screen reader. */
export const heroAltSchema = safeText()
  .trim()
  .min(1, 'Describe the image for readers who cannot see it')
  .max(300, 'Keep the description under 300 characters');

export const saveDispatchSchema = z.object({
  title,
  bodyMarkdown,
  audience,
  charts: z.array(chart).max(DISPATCH_CHARTS_MAX, `At most ${DISPATCH_CHARTS_MAX} charts per dispatch`).default([]),
  emailOnPublish: z.boolean().default(false),
  heroAlt: safeText().trim().max(300).default(''),
});
export type SaveDispatchInput = z.input<typeof saveDispatchSchema>;
export type SaveDispatch = z.output<typeof saveDispatchSchema>;

export const renderMarkdownSchema = z.object({ markdown: bodyMarkdown });

export const transitionDispatchSchema = z.discriminatedUnion('to', [
  z.object({ to: z.literal('draft') }),
  z.object({
    to: z.literal('scheduled'),
    publishAt: z.iso.datetime({ offset: true, message: 'must be a date and time' }).refine((s) => Date.parse(s) > Date.now(), {
      message: 'Choose a time in the future',
    }),
  }),
  z.object({ to: z.literal('published') }),
  z.object({ to: z.literal('withdrawn') }),
]);
export type TransitionDispatch = z.infer<typeof transitionDispatchSchema>;

export const unsubscribeSchema = z.object({
  token: safeText().min(10).max(400),
});

// ---- views ----

export type DispatchChartView = {
  snapshotId: string;
  title: string;
  caption: string;
  alt: string;
  imagePath: string;
};

export type DispatchSummary = {
  id: string;
  slug: string;
  title: string;
  state: DispatchState;
  audience: { kind: AudienceKind; tierIds: string[] };
  publishAt: string | null;
  publishedAt: string | null;
  updatedAt: string;
  version: number;
  emailOnPublish: boolean;
};

export type DispatchDetail = DispatchSummary & {
  bodyMarkdown: string;
  bodyHtml: string;
  heroImagePath: string | null;
  heroAlt: string;
  charts: DispatchChartView[];
  allowed: readonly DispatchState[];
};

export type DispatchVersionView = { version: number; title: string; editedBy: string | null; createdAt: string };

export type PublicDispatchView =
  | {
      access: 'open';
      slug: string;
      title: string;
      excerpt: string;
      publishedAt: string;
      audienceLabel: string;
      bodyHtml: string;
      heroImagePath: string | null;
      heroAlt: string;
      charts: DispatchChartView[];
      edited: boolean;
    }
  | { access: 'for-backers'; slug: string; title: string; publishedAt: string; audienceLabel: string; signedIn: boolean };

export type DispatchFeedItem = {
  slug: string;
  title: string;
  excerpt: string;
  publishedAt: string;
  audienceLabel: string;
  locked: boolean;
  heroImagePath: string | null;
};

export type DispatchProgress = {
  state: 'none' | 'pending' | 'sending' | 'done';
  total: number;
  queued: number;
  sent: number;
  failed: number;
  failures: { recipientId: string | null; email: string; error: string; attempts: number; mailId: number | string }[];
};
