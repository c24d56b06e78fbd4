import type { historySortKeys, sailModes } from '@shared/schemas/orbit';
import type {
  HistoryPageReply,
  HistoryRowReply,
  PublicSnapshotReply,
  RateLineReply,
  SailingPeriodReply,
  SailYieldReply,
  SnapshotReply,
  SnapshotSummaryReply,
  SpacecraftReply,
  TrendRatesReply,
  TrendRateWindowReply,
  TrendReply,
  TrendViewReply,
  UploadErrorReply,
  UploadReply,
} from '@shared/schemas/orbit-replies';

// What the orbit-desk endpoints answer: the shapes are defined once in shared/schemas/orbit-replies.ts, which the
// server's views are typed by and the API tests parse real answers with. Only the names here are the client's.
export type Spacecraft = SpacecraftReply;
export type UploadError = UploadErrorReply;
export type Upload = UploadReply;
export type UploadStatus = Upload['status'];
export type HistoryRow = HistoryRowReply;
export type HistoryPage = HistoryPageReply;
export type SailMode = (typeof sailModes)[number];
export type SailingPeriod = SailingPeriodReply;
export type RateLine = RateLineReply;
export type TrendRates = TrendRatesReply;
export type Trend = TrendReply;
export type TrendView = TrendViewReply;
export type TrendRateWindow = TrendRateWindowReply;
export type SailYield = SailYieldReply;
export type SnapshotSummary = SnapshotSummaryReply;
export type Snapshot = SnapshotReply;
export type PublicSnapshot = PublicSnapshotReply;

// What the history table asks for (the query the server parses with historyQuerySchema).
export type HistorySort = (typeof historySortKeys)[number];
export type HistoryParams = { page: number; pageSize: number; sort: HistorySort; dir: 'asc' | 'desc'; from?: string; to?: string };
