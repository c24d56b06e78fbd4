import type { SnapshotData, SnapshotSeriesKey } from '@shared/charts/snapshot-chart';

// What the orbit-desk endpoints answer (server/modules/orbit/*).
export type Spacecraft = {
  id: string;
  slug: string;
  name: string;
  catalogNumber: string;
  internationalDesignator: string;
  massKg: number;
  sailAreaM2: number;
  sailReflectivity: number;
  dragCoefficient: number;
  dragAreaEdgeOnM2: number;
  launchDate: string | null;
  sailDeployedAt: string | null;
  isMissionCraft: boolean;
  hasSail: boolean;
  createdAt: string;
  updatedAt: string;
};

export type UploadError = {
  line: number;
  columns?: [number, number];
  field?: string;
  message: string;
  expected?: string;
  object?: { catalogNumber: string; name: string | null; internationalDesignator: string };
};
export type UploadStatus = 'parsing' | 'previewed' | 'importing' | 'imported' | 'cancelled' | 'failed';
export type Upload = {
  id: string;
  spacecraftId: string;
  status: UploadStatus;
  filename: string;
  byteSize: number;
  format: string | null;
  progress: { processed: number; total: number };
  counts: { records: number; new: number; duplicate: number; invalid: number };
  importedCount: number | null;
  errors: UploadError[];
  existingFile: { id: string; filename: string; uploadedAt: string } | null;
  fileId: string | null;
  message: string | null;
  createdAt: string;
  updatedAt: string;
};

export type HistoryRow = {
  id: number;
  epoch: string;
  epochMs: number;
  elementSetNo: number;
  semiMajorAxisKm: number;
  eccentricity: number;
  inclinationDeg: number;
  apogeeAltitudeKm: number;
  perigeeAltitudeKm: number;
  bstar: number;
  outlier: boolean;
  sourceLine: number;
  fileId: string;
  fileName: string;
};
export type HistoryPage = { rows: HistoryRow[]; page: number; pageSize: number; total: number; pageCount: number };
export type HistorySort =
  'epoch' | 'elementSetNo' | 'semiMajorAxisKm' | 'eccentricity' | 'inclinationDeg' | 'apogeeAltitudeKm' | 'perigeeAltitudeKm' | 'bstar';
export type HistoryParams = { page: number; pageSize: number; sort: HistorySort; dir: 'asc' | 'desc'; from?: string; to?: string };

export type SailMode = 'raising' | 'edge-on' | 'tumbling' | 'unknown';
export type SailingPeriod = {
  id: string;
  spacecraftId: string;
  startAt: string;
  endAt: string;
  mode: SailMode;
  note: string;
  createdAt: string;
  updatedAt: string;
};

export type RateLine = { fromMs: number; toMs: number; fromValue: number; toValue: number; slopePerDay: number };
export type TrendRates = {
  apogeeKmPerDay: number;
  perigeeKmPerDay: number;
  semiMajorAxisKmPerDay: number;
  energyJPerKgPerDay: number;
  alongTrackAccelMPerS2: number;
};
type TrendValues = { apogeeKm: number[]; perigeeKm: number[]; meanAltitudeKm: number[]; semiMajorAxisKm: number[]; energyJPerKg: number[] };
export type Trend = {
  spacecraft: Spacecraft;
  /** The view, reduced to min/max per pixel column when it holds more than two points per column. */
  series: { epochMs: number[] } & TrendValues;
  outliers: { epochMs: number[] } & TrendValues;
  view: { fromMs: number; toMs: number; columns: number; reduced: boolean; pointsInView: number };
  extent: { firstMs: number | null; lastMs: number | null; total: number };
  window: { fromMs: number; toMs: number; outlierEpochsMs: number[] };
  rates: TrendRates | null;
  intervals: { [K in keyof TrendRates]: [number, number] } | null;
  counts: { input: number; inWindow: number; duplicatesRemoved: number; outliers: number; used: number; otherObjects: number };
  spanDays: number;
  rateLines: Record<'apogee' | 'perigee' | 'meanAltitude' | 'semiMajorAxis' | 'energy', RateLine | null> | null;
  sailingPeriods: SailingPeriod[];
};

type ModeSummary = {
  periodCount: number;
  pointCount: number;
  energyRateJPerKgPerDay: number | null;
  alongTrackAccelMPerS2: number | null;
  uncertaintyMPerS2: number | null;
};
export type SailYield = {
  spacecraft: Spacecraft;
  sailApplies: boolean;
  comparison: null | {
    raising: ModeSummary;
    off: ModeSummary;
    sailYieldMPerS2: number | null;
    uncertaintyMPerS2: number | null;
    sailYieldJPerKgPerDay: number | null;
    notes: string[];
  };
  model: null | {
    atEpochMs: number;
    altitudeKm: number;
    betaDeg: number;
    sunlitFraction: number;
    usableThrustFraction: number;
    raisingDragAreaM2: number;
    byActivity: {
      activity: 'low' | 'mean' | 'high';
      densityKgPerM3: number;
      expectedSailAccelMPerS2: number;
      dragAccelRaisingMPerS2: number;
      dragAccelEdgeOnMPerS2: number;
      crossoverAltitudeKm: number | null;
    }[];
    assumptions: string[];
  };
  lifetime?: null | {
    startAltitudeKm: number;
    method: string;
    assumptions: string[];
    basis: string;
    low: LifetimeCase;
    mean: LifetimeCase;
    high: LifetimeCase;
  };
  caution: string;
};
type LifetimeCase = { activity: string; reentryIso: string | null; days: number | null; exceedsHorizon: boolean };

export type SnapshotSummary = {
  id: string;
  slug: string;
  spacecraftId: string;
  title: string;
  caption: string;
  isPublic: boolean;
  owner: { id: string; displayName: string } | null;
  publicPath: string;
  svgPath: string;
  pngPath: string;
  window: { fromMs: number; toMs: number };
  series: SnapshotSeriesKey[];
  createdAt: string;
  updatedAt: string;
};
export type Snapshot = SnapshotSummary & { data: SnapshotData };
export type PublicSnapshot = {
  slug: string;
  title: string;
  caption: string;
  data: SnapshotData;
  createdAt: string;
  svgPath: string;
  pngPath: string;
};
