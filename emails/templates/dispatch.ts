import { z } from 'zod';
import { ORBIT_CAUTION } from '../../shared/charts/snapshot-chart';
import type { EmailContent } from '../layout';

const line = z
  .string()
  .trim()
  .min(1)
  .max(300)
  .refine((s) => !/[\u0000-\u001f\u007f]/.test(s), 'must not contain control characters or line breaks');
const link = z.url({ protocol: /^https?$/ });

// Above this many characters the e-mail carries the excerpt and a link instead of the full text.
export const DISPATCH_FULL_TEXT_MAX = 6000;

export const dispatchEmailSchema = z.object({
  title: line,
  bodyMarkdown: z.string().max(50_000),
  excerpt: z.string().max(400),
  pageUrl: link,
  siteUrl: link,
  heroImageUrl: link.optional(),
  heroAlt: z.string().max(300).default(''),
  charts: z
    .array(z.object({ imageUrl: link, alt: line, caption: z.string().max(600).default(''), title: line }))
    .max(3)
    .default([]),
  audienceLine: line,
  unsubscribeUrl: link,
  choicesUrl: link,
});

export function dispatchEmail(d: z.output<typeof dispatchEmailSchema>): EmailContent {
  const full = d.bodyMarkdown.length <= DISPATCH_FULL_TEXT_MAX;
  return {
    subject: d.title,
    preview: d.excerpt || d.title,
    heading: d.title,
    blocks: [
      ...(d.heroImageUrl ? [{ kind: 'image' as const, src: d.heroImageUrl, alt: d.heroAlt || d.title }] : []),
      full ? { kind: 'markdown' as const, markdown: d.bodyMarkdown, baseUrl: d.siteUrl } : { kind: 'paragraph' as const, text: d.excerpt },
      ...d.charts.map((c) => ({
        kind: 'image' as const,
        src: c.imageUrl,
        alt: c.alt,
        caption: c.caption ? `${c.title}: ${c.caption}` : c.title,
        caution: ORBIT_CAUTION,
      })),
      { kind: 'button' as const, label: full ? 'Read on the site' : 'Read the whole dispatch on the site', url: d.pageUrl },
    ],
    reason: `You get this e-mail because you follow the mission as ${d.audienceLine} and chose to receive dispatches.`,
    unsubscribeUrl: d.unsubscribeUrl,
    choicesUrl: d.choicesUrl,
  };
}
