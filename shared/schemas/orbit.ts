import { z } from 'zod';
import { safeText } from './text';

// Payloads of the orbit desk, used by the Express validators and by the client's forms.

export const sailModes = ['raising', 'edge-on', 'tumbling', 'unknown'] as const;
export const sailModeSchema = z.enum(sailModes);

const isoDateTime = z.iso.datetime({ offset: true, message: 'must be a date and time such as 2025-03-01T00:00:00Z' });
const optionalDate = z
  .union([z.iso.date({ message: 'must be a date such as 2025-03-01' }), z.literal(''), z.null()])
  .optional()
  .transform((v) => (v ? v : null));
const optionalDateTime = z
  .union([isoDateTime, z.literal(''), z.null()])
  .optional()
  .transform((v) => (v ? v : null));

/** A number field that may be left out or empty: then 0 (a form sends "", an API client may send nothing). */
const zeroWhenAbsent = (inner: z.ZodNumber) =>
  z.preprocess(
    (v) => (v === undefined || v === null || (typeof v === 'string' && v.trim() === '') ? 0 : typeof v === 'string' ? Number(v) : v),
    inner,
  );

export const spacecraftInputSchema = z.object({
  name: safeText().trim().min(1, { message: 'Give the craft a name' }).max(80),
  slug: safeText()
    .trim()
    .toLowerCase()
    .regex(/^[a-z0-9]+(-[a-z0-9]+)*$/, { message: 'use lower-case letters, digits and single hyphens' })
    .max(40),
  catalogNumber: safeText()
    .trim()
    .regex(/^(\d{1,5}|[A-HJ-NP-Z]\d{4})$/, { message: 'must be up to five digits, or a letter and four digits' }),
  internationalDesignator: safeText()
    .trim()
    .toUpperCase()
    .regex(/^(\d{5}[A-Z]{1,3})?$/, { message: 'must look like 25012A (year, launch number, piece) or be empty' })
    .default(''),
  massKg: z.coerce.number().gt(0, { message: 'must be more than 0 kg' }).max(10_000),
  /** 0 (or left out) for a comparison object without a sail. */
  sailAreaM2: zeroWhenAbsent(
    z.number({ message: 'must be a number (0 for no sail)' }).min(0, { message: 'must be 0 m² (no sail) or more' }).max(100_000),
  ),
  sailReflectivity: zeroWhenAbsent(
    z
      .number({ message: 'must be between 0 and 1' })
      .min(0, { message: 'must be between 0 and 1' })
      .max(1, { message: 'must be between 0 and 1' }),
  ),
  dragCoefficient: z.coerce.number().gt(0).max(10),
  dragAreaEdgeOnM2: z.coerce.number().gt(0, { message: 'must be more than 0 m²' }).max(100_000),
  launchDate: optionalDate,
  sailDeployedAt: optionalDateTime,
  /** The mission's own craft (at most one): marking this one unmarks the other. */
  isMissionCraft: z.boolean().default(false),
});
export type SpacecraftInput = z.output<typeof spacecraftInputSchema>;

/** The text fields of an upload (multipart): pasted sets instead of a file, and a name for them. */
export const uploadFieldsSchema = z.object({
  text: safeText({ multiline: true }).optional(),
  filename: safeText().trim().max(255, { message: 'Keep the file name to 255 characters' }).optional(),
});
/**
 * A status request for an upload: with `after` (the `version` the client holds) the answer waits, up to `wait`
 * seconds, until the upload is no longer that version; without it the answer comes at once.
 */
export const uploadStatusQuerySchema = z.object({
  after: safeText().max(100, { message: 'must be the version an earlier answer gave' }).optional(),
  wait: z.coerce.number().int().min(1).max(25).default(25),
});
/** The uploaded file's own name, as the browser sent it. */
export const uploadFileSchema = z.object({ name: safeText().max(255, { message: 'Keep the file name to 255 characters' }) }).optional();

export const sailingPeriodInputSchema = z
  .object({
    startAt: isoDateTime,
    endAt: isoDateTime,
    mode: sailModeSchema,
    note: safeText({ multiline: true }).trim().max(2000).default(''),
  })
  .refine((p) => Date.parse(p.endAt) > Date.parse(p.startAt), { message: 'must be after the start', path: ['endAt'] });
export type SailingPeriodInput = z.output<typeof sailingPeriodInputSchema>;

export const historySortKeys = [
  'epoch',
  'elementSetNo',
  'semiMajorAxisKm',
  'eccentricity',
  'inclinationDeg',
  'apogeeAltitudeKm',
  'perigeeAltitudeKm',
  'bstar',
] as const;

export const historyQuerySchema = z.object({
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(500).default(50),
  sort: z.enum(historySortKeys).default('epoch'),
  dir: z.enum(['asc', 'desc']).default('desc'),
  from: isoDateTime.optional(),
  to: isoDateTime.optional(),
});
export type HistoryQuery = z.output<typeof historyQuerySchema>;

// The chart's view and the rate window, each with its order check; the whole trend asks for both.
const trendViewFields = z.object({
  /** The chart's view; defaults to the whole history. */
  viewFrom: isoDateTime.optional(),
  viewTo: isoDateTime.optional(),
  /** Pixel columns the chart has: the view comes reduced to min/max per column. */
  columns: z.coerce.number().int().min(10).max(4000).default(1000),
});
const trendRateFields = z.object({
  /** The window for the rate lines; defaults to the last 30 days of the history. */
  from: isoDateTime.optional(),
  to: isoDateTime.optional(),
});
const viewInOrder = (q: { viewFrom?: string; viewTo?: string }) =>
  !q.viewFrom || !q.viewTo || Date.parse(q.viewTo) > Date.parse(q.viewFrom);
const viewOutOfOrder = { message: 'must be after the view start', path: ['viewTo'] };
const ratesInOrder = (q: { from?: string; to?: string }) => !q.from || !q.to || Date.parse(q.to) > Date.parse(q.from);
const ratesOutOfOrder = { message: 'must be after the window start', path: ['to'] };

export const trendQuerySchema = trendRateFields
  .extend(trendViewFields.shape)
  .refine(viewInOrder, viewOutOfOrder)
  .refine(ratesInOrder, ratesOutOfOrder);

/** The chart's part of the trend alone: the view, reduced per pixel column (a zoom step asks only for this). */
export const trendViewQuerySchema = trendViewFields.refine(viewInOrder, viewOutOfOrder);

/** The rate window's part alone: its robust rates and rate lines (defaults to the last 30 days of the history). */
export const trendRatesQuerySchema = trendRateFields.refine(ratesInOrder, ratesOutOfOrder);

export const snapshotSeriesKeys = ['apogee', 'perigee', 'meanAltitude', 'semiMajorAxis', 'energy'] as const;
export const snapshotSeriesSchema = z.enum(snapshotSeriesKeys);
export type SnapshotSeries = z.infer<typeof snapshotSeriesSchema>;

export const snapshotAnnotationSchema = z.object({
  atMs: z.number().finite(),
  text: safeText().trim().min(1).max(200),
});

export const createSnapshotSchema = z
  .object({
    /** Left out: the mission craft. */
    spacecraftId: z.uuid().optional(),
    title: safeText().trim().min(1, { message: 'Give the snapshot a title' }).max(120),
    caption: safeText({ multiline: true }).trim().max(1000).default(''),
    fromMs: z.number().finite(),
    toMs: z.number().finite(),
    series: z.array(snapshotSeriesSchema).min(1, { message: 'pick at least one series' }).max(5),
    /** The window of the rate lines; defaults to the chart's window. */
    rateFromMs: z.number().finite().optional(),
    rateToMs: z.number().finite().optional(),
    annotations: z.array(snapshotAnnotationSchema).max(20).default([]),
    isPublic: z.boolean().default(false),
  })
  .refine((s) => s.toMs > s.fromMs, { message: 'must be after the start', path: ['toMs'] })
  .refine((s) => new Set(s.series.map((k) => (k === 'semiMajorAxis' ? 'a' : k === 'energy' ? 'e' : 'h'))).size <= 2, {
    message: 'pick series of at most two kinds (altitudes, semi-major axis, energy): a chart has two axes',
    path: ['series'],
  });
export type CreateSnapshotInput = z.output<typeof createSnapshotSchema>;

export const updateSnapshotSchema = z.object({
  title: safeText().trim().min(1, { message: 'Give the snapshot a title' }).max(120).optional(),
  caption: safeText({ multiline: true }).trim().max(1000).optional(),
  isPublic: z.boolean().optional(),
});
