// What the orbit desk's endpoints answer, written once: the server's views are typed by these (so a view that
// leaves the shape does not compile), the client's types are these (src/features/orbit/types.ts), and the API
// tests parse real answers with them (strict objects: a field added, renamed or dropped on one side fails there).
import { z } from 'zod';
import type { SnapshotData } from '../charts/snapshot-chart';
import { sailModeSchema, snapshotSeriesSchema } from './orbit';

const isoTimestamp = z.iso.datetime();
const num = z.number();
const int = z.number().int();
const nullableNum = z.number().nullable();

export const spacecraftReplySchema = z.strictObject({
  id: z.uuid(),
  slug: z.string(),
  name: z.string(),
  catalogNumber: z.string(),
  internationalDesignator: z.string(),
  massKg: num,
  sailAreaM2: num,
  sailReflectivity: num,
  dragCoefficient: num,
  dragAreaEdgeOnM2: num,
  launchDate: z.iso.date().nullable(),
  sailDeployedAt: isoTimestamp.nullable(),
  isMissionCraft: z.boolean(),
  hasSail: z.boolean(),
  createdAt: isoTimestamp,
  updatedAt: isoTimestamp,
});
export type SpacecraftReply = z.infer<typeof spacecraftReplySchema>;

// Uploads ------------------------------------------------------------------------------------------------------

export const uploadErrorSchema = z.strictObject({
  line: int,
  columns: z.tuple([int, int]).optional(),
  field: z.string().optional(),
  message: z.string(),
  expected: z.string().optional(),
  object: z.strictObject({ catalogNumber: z.string(), name: z.string().nullable(), internationalDesignator: z.string() }).optional(),
});
export type UploadErrorReply = z.infer<typeof uploadErrorSchema>;

export const uploadStatuses = ['parsing', 'previewed', 'importing', 'imported', 'cancelled', 'failed'] as const;
export const uploadReplySchema = z.strictObject({
  id: z.uuid(),
  spacecraftId: z.uuid(),
  status: z.enum(uploadStatuses),
  filename: z.string(),
  byteSize: int,
  format: z.string().nullable(),
  progress: z.strictObject({ processed: int, total: int }),
  counts: z.strictObject({ records: int, new: int, duplicate: int, invalid: int }),
  importedCount: int.nullable(),
  errors: z.array(uploadErrorSchema),
  existingFile: z.strictObject({ id: z.uuid(), filename: z.string(), uploadedAt: isoTimestamp }).nullable(),
  fileId: z.uuid().nullable(),
  message: z.string().nullable(),
  createdAt: isoTimestamp,
  updatedAt: isoTimestamp,
  /** Changes whenever the upload does: a status request with `after` set to it waits for the next change. */
  version: z.string(),
});
export type UploadReply = z.infer<typeof uploadReplySchema>;

export const elementSetFileReplySchema = z.strictObject({
  id: z.uuid(),
  filename: z.string(),
  format: z.string(),
  byteSize: int,
  contentSha256: z.string(),
  recordCount: int,
  importedCount: int,
  duplicateCount: int,
  invalidCount: int,
  uploadedAt: isoTimestamp,
  uploadedBy: z.string().nullable(),
});
export type ElementSetFileReply = z.infer<typeof elementSetFileReplySchema>;

// History ------------------------------------------------------------------------------------------------------

export const historyRowReplySchema = z.strictObject({
  id: int,
  epoch: isoTimestamp,
  epochMs: num,
  elementSetNo: int,
  semiMajorAxisKm: num,
  eccentricity: num,
  inclinationDeg: num,
  apogeeAltitudeKm: num,
  perigeeAltitudeKm: num,
  bstar: num,
  outlier: z.boolean(),
  sourceLine: int,
  fileId: z.uuid(),
  fileName: z.string(),
});
export type HistoryRowReply = z.infer<typeof historyRowReplySchema>;

export const historyPageReplySchema = z.strictObject({
  rows: z.array(historyRowReplySchema),
  page: int,
  pageSize: int,
  total: int,
  pageCount: int,
});
export type HistoryPageReply = z.infer<typeof historyPageReplySchema>;

// Sailing periods -----------------------------------------------------------------------------------------------

export const sailingPeriodReplySchema = z.strictObject({
  id: z.uuid(),
  spacecraftId: z.uuid(),
  startAt: isoTimestamp,
  endAt: isoTimestamp,
  mode: sailModeSchema,
  note: z.string(),
  createdAt: isoTimestamp,
  updatedAt: isoTimestamp,
});
export type SailingPeriodReply = z.infer<typeof sailingPeriodReplySchema>;

// Trend --------------------------------------------------------------------------------------------------------

export const rateLineSchema = z.strictObject({ fromMs: num, toMs: num, fromValue: num, toValue: num, slopePerDay: num });
export type RateLineReply = z.infer<typeof rateLineSchema>;

export const trendRatesSchema = z.strictObject({
  apogeeKmPerDay: num,
  perigeeKmPerDay: num,
  semiMajorAxisKmPerDay: num,
  energyJPerKgPerDay: num,
  alongTrackAccelMPerS2: num,
});
export type TrendRatesReply = z.infer<typeof trendRatesSchema>;

const interval = z.tuple([num, num]);
const trendValues = {
  epochMs: z.array(num),
  apogeeKm: z.array(num),
  perigeeKm: z.array(num),
  meanAltitudeKm: z.array(num),
  semiMajorAxisKm: z.array(num),
  energyJPerKg: z.array(num),
};

export const trendReplySchema = z.strictObject({
  spacecraft: spacecraftReplySchema,
  /** The view, reduced to min/max per pixel column when it holds more than two points per column. */
  series: z.strictObject(trendValues),
  /** The outliers in the view, apart (ringed, not joined to the line). */
  outliers: z.strictObject(trendValues),
  view: z.strictObject({ fromMs: num, toMs: num, columns: int, reduced: z.boolean(), pointsInView: int }),
  extent: z.strictObject({ firstMs: nullableNum, lastMs: nullableNum, total: int }),
  window: z.strictObject({ fromMs: num, toMs: num, outlierEpochsMs: z.array(num) }),
  rates: trendRatesSchema.nullable(),
  intervals: z
    .strictObject({
      apogeeKmPerDay: interval,
      perigeeKmPerDay: interval,
      semiMajorAxisKmPerDay: interval,
      energyJPerKgPerDay: interval,
      alongTrackAccelMPerS2: interval,
    })
    .nullable(),
  counts: z.strictObject({ input: int, inWindow: int, duplicatesRemoved: int, outliers: int, used: int, otherObjects: int }),
  spanDays: num,
  rateLines: z
    .strictObject({
      apogee: rateLineSchema.nullable(),
      perigee: rateLineSchema.nullable(),
      meanAltitude: rateLineSchema.nullable(),
      semiMajorAxis: rateLineSchema.nullable(),
      energy: rateLineSchema.nullable(),
    })
    .nullable(),
  sailingPeriods: z.array(sailingPeriodReplySchema),
});
export type TrendReply = z.infer<typeof trendReplySchema>;

/** GET …/trend/view: what the chart draws for one view (no rate fit). */
export const trendViewReplySchema = trendReplySchema.pick({
  spacecraft: true,
  series: true,
  outliers: true,
  view: true,
  extent: true,
  sailingPeriods: true,
});
export type TrendViewReply = z.infer<typeof trendViewReplySchema>;

/** GET …/trend/rates: the rate window's fit, rates and rate lines. */
export const trendRateWindowReplySchema = trendReplySchema.pick({
  window: true,
  rates: true,
  intervals: true,
  counts: true,
  spanDays: true,
  rateLines: true,
});
export type TrendRateWindowReply = z.infer<typeof trendRateWindowReplySchema>;

// Sail yield ---------------------------------------------------------------------------------------------------

const modeSummarySchema = z.strictObject({
  modes: z.array(sailModeSchema),
  periodCount: int,
  pointCount: int,
  energyRateJPerKgPerDay: nullableNum,
  uncertaintyJPerKgPerDay: nullableNum,
  alongTrackAccelMPerS2: nullableNum,
  uncertaintyMPerS2: nullableNum,
});
const activitySchema = z.enum(['low', 'mean', 'high']);
const lifetimeCaseSchema = z.strictObject({
  activity: activitySchema,
  reentryMs: nullableNum,
  reentryIso: isoTimestamp.nullable(),
  days: nullableNum,
  exceedsHorizon: z.boolean(),
});

export const sailYieldReplySchema = z.strictObject({
  spacecraft: spacecraftReplySchema,
  /** False for a craft without a sail: the sail panels say they do not apply. */
  sailApplies: z.boolean(),
  comparison: z
    .strictObject({
      raising: modeSummarySchema,
      off: modeSummarySchema,
      periods: z.array(
        z.strictObject({
          startMs: num,
          endMs: num,
          mode: sailModeSchema,
          pointCount: int,
          energyRateJPerKgPerDay: nullableNum,
          standardErrorJPerKgPerDay: nullableNum,
          meanSemiMajorAxisKm: nullableNum,
        }),
      ),
      sailYieldMPerS2: nullableNum,
      uncertaintyMPerS2: nullableNum,
      sailYieldJPerKgPerDay: nullableNum,
      notes: z.array(z.string()),
    })
    .nullable(),
  model: z
    .strictObject({
      atEpochMs: num,
      altitudeKm: num,
      betaDeg: num,
      sunlitFraction: num,
      usableThrustFraction: num,
      raisingDragAreaM2: num,
      byActivity: z.array(
        z.strictObject({
          activity: activitySchema,
          densityKgPerM3: num,
          expectedSailAccelMPerS2: num,
          dragAccelRaisingMPerS2: num,
          dragAccelEdgeOnMPerS2: num,
          netRaisingSemiMajorAxisKmPerDay: num,
          edgeOnSemiMajorAxisKmPerDay: num,
          crossoverAltitudeKm: nullableNum,
        }),
      ),
      assumptions: z.array(z.string()),
    })
    .nullable(),
  lifetime: z
    .strictObject({
      startMs: num,
      startAltitudeKm: num,
      low: lifetimeCaseSchema,
      mean: lifetimeCaseSchema,
      high: lifetimeCaseSchema,
      method: z.string(),
      caution: z.string(),
      assumptions: z.array(z.string()),
      /** What the estimate assumes of the craft, in words ("sail edge-on, drag only"). */
      basis: z.string(),
    })
    .nullable(),
  caution: z.string(),
});
export type SailYieldReply = z.infer<typeof sailYieldReplySchema>;

// Snapshots ----------------------------------------------------------------------------------------------------

const seriesValues = z.partialRecord(snapshotSeriesSchema, z.array(num));
export const snapshotDataSchema = z.strictObject({
  version: z.literal(1),
  spacecraftName: z.string(),
  fromMs: num,
  toMs: num,
  series: z.array(snapshotSeriesSchema),
  points: z.strictObject({ epochMs: z.array(num), values: seriesValues, outlier: z.array(z.boolean()) }),
  sailingPeriods: z.array(z.strictObject({ startMs: num, endMs: num, mode: sailModeSchema })),
  annotations: z.array(z.strictObject({ atMs: num, text: z.string() })),
  rateLines: z.partialRecord(snapshotSeriesSchema, rateLineSchema.nullable()),
  rateWindow: z.strictObject({ fromMs: num, toMs: num }).nullable(),
});
// The snapshot renderer's own type and this schema describe the same thing (checked when compiling).
type Same<A, B> = [A] extends [B] ? ([B] extends [A] ? true : false) : false;
const snapshotDataMatches: Same<z.infer<typeof snapshotDataSchema>, SnapshotData> = true;
void snapshotDataMatches;

export const snapshotSummaryReplySchema = z.strictObject({
  id: z.uuid(),
  slug: z.string(),
  spacecraftId: z.uuid(),
  title: z.string(),
  caption: z.string(),
  isPublic: z.boolean(),
  owner: z.strictObject({ id: z.uuid(), displayName: z.string() }).nullable(),
  publicPath: z.string(),
  svgPath: z.string(),
  pngPath: z.string(),
  window: z.strictObject({ fromMs: num, toMs: num }),
  series: z.array(snapshotSeriesSchema),
  createdAt: isoTimestamp,
  updatedAt: isoTimestamp,
});
export type SnapshotSummaryReply = z.infer<typeof snapshotSummaryReplySchema>;

export const snapshotReplySchema = snapshotSummaryReplySchema.extend({ data: snapshotDataSchema });
export type SnapshotReply = z.infer<typeof snapshotReplySchema>;

export const publicSnapshotReplySchema = z.strictObject({
  slug: z.string(),
  title: z.string(),
  caption: z.string(),
  data: snapshotDataSchema,
  createdAt: isoTimestamp,
  svgPath: z.string(),
  pngPath: z.string(),
});
export type PublicSnapshotReply = z.infer<typeof publicSnapshotReplySchema>;

// The answers as sent, envelope included --------------------------------------------------------------------------

export const orbitReplies = {
  spacecraftList: z.strictObject({ spacecraft: z.array(spacecraftReplySchema) }),
  spacecraft: z.strictObject({ spacecraft: spacecraftReplySchema }),
  upload: z.strictObject({ upload: uploadReplySchema }),
  files: z.strictObject({ files: z.array(elementSetFileReplySchema) }),
  history: historyPageReplySchema,
  trend: trendReplySchema,
  sailYield: sailYieldReplySchema,
  sailingPeriods: z.strictObject({ sailingPeriods: z.array(sailingPeriodReplySchema) }),
  sailingPeriod: z.strictObject({ sailingPeriod: sailingPeriodReplySchema }),
  snapshotList: z.strictObject({ snapshots: z.array(snapshotSummaryReplySchema) }),
  snapshot: z.strictObject({ snapshot: snapshotReplySchema }),
  publicSnapshot: z.strictObject({ snapshot: publicSnapshotReplySchema }),
} as const;
export type OrbitReply<K extends keyof typeof orbitReplies> = z.infer<(typeof orbitReplies)[K]>;
