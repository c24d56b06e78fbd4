import { z } from 'zod';
import type { EmailContent } from '../layout';

const line = z
  .string()
  .trim()
  .min(1)
  .max(200)
  .refine((s) => !/[\u0000-\u001f\u007f]/.test(s), 'must not contain control characters or line breaks');
const link = z.url({ protocol: /^https?$/ });
const when = z.union([z.date(), z.iso.datetime({ offset: true })]);
const skyPoint = z.object({ at: when, elevationDeg: z.number().min(-90).max(90), compass: z.string().regex(/^[NESW]{1,3}$/) });

export const SUN_CAUTION = 'Never look at or near the Sun, with or without binoculars: it can blind you in an instant.';
export const TIMES_SHIFT_CAUTION =
  'Times shift by minutes as the orbit slowly decays: check the newest times on the site before you go out.';

export const passReminderSchema = z.object({
  displayName: line,
  craftName: line,
  placeName: line,
  timeZone: line,
  start: skyPoint,
  highest: skyPoint,
  end: skyPoint,
  skyWatchUrl: link,
  unsubscribeUrl: link,
  choicesUrl: link,
});

function clock(value: Date | string, timeZone: string, withDay: boolean) {
  const date = value instanceof Date ? value : new Date(value);
  const time = new Intl.DateTimeFormat('en-GB', { timeZone, hour: '2-digit', minute: '2-digit' }).format(date);
  if (!withDay) return time;
  const day = new Intl.DateTimeFormat('en-GB', { timeZone, weekday: 'long', day: 'numeric', month: 'long' }).format(date);
  const zone =
    new Intl.DateTimeFormat('en-GB', { timeZone, timeZoneName: 'short' }).formatToParts(date).find((p) => p.type === 'timeZoneName')
      ?.value ?? timeZone;
  return `${day}, ${time} ${zone}`;
}

export function passReminderEmail(d: z.output<typeof passReminderSchema>): EmailContent {
  const highest = Math.round(d.highest.elevationDeg);
  const day = clock(d.start.at, d.timeZone, true);
  return {
    subject: `${d.craftName} passes over ${d.placeName}, up to ${highest}° high: ${day}`,
    preview: `Look up from ${d.start.compass} at ${clock(d.start.at, d.timeZone, false)}.`,
    heading: `${d.craftName} crosses your sky at ${d.placeName}`,
    blocks: [
      {
        kind: 'paragraph',
        text: `Hello ${d.displayName}, a good pass is coming: ${d.craftName} climbs to ${highest}° above the horizon, sunlit against a dark sky. It looks like a steady star moving across the sky.`,
      },
      {
        kind: 'facts',
        rows: [
          {
            label: 'Appears',
            value: `${clock(d.start.at, d.timeZone, true)}, ${d.start.compass}, ${Math.round(d.start.elevationDeg)}° up`,
          },
          { label: 'Highest', value: `${clock(d.highest.at, d.timeZone, false)}, ${d.highest.compass}, ${highest}° up` },
          { label: 'Fades', value: `${clock(d.end.at, d.timeZone, false)}, ${d.end.compass}, ${Math.round(d.end.elevationDeg)}° up` },
          { label: 'Times in', value: d.timeZone },
        ],
      },
      { kind: 'button', label: 'See the newest times in sky watch', url: d.skyWatchUrl },
      { kind: 'note', text: SUN_CAUTION },
      { kind: 'note', text: TIMES_SHIFT_CAUTION },
    ],
    reason: `You get this e-mail because you saved the place "${d.placeName}" in Lightkeel and turned on pass reminders.`,
    unsubscribeUrl: d.unsubscribeUrl,
    choicesUrl: d.choicesUrl,
  };
}
