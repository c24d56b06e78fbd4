import { AppError, badRequest, conflict, notFound } from '../../errors';
import { formatUtcDateTime } from '../../../shared/dates';

// The orbit desk's errors, each with a stable code.
export const spacecraftNotFound = () => notFound('orbit.spacecraft_not_found', 'No spacecraft with this id.');
export const spacecraftTaken = (what: 'slug' | 'catalog number') =>
  conflict(`orbit.spacecraft_${what === 'slug' ? 'slug' : 'catalog'}_taken`, `Another spacecraft already uses this ${what}.`);
export const missionCraftRace = () =>
  conflict('orbit.mission_craft_changed', 'Another craft was marked as the mission craft at the same moment. Reload and try again.');
export const ingestUnavailable = () =>
  new AppError(
    503,
    'orbit.ingest_unavailable',
    'Reading element sets needs the background workers, which this server was started without.',
  );
export const uploadNotFound = () => notFound('orbit.upload_not_found', 'No upload with this id.');
export const uploadNotReady = (status: string) =>
  conflict('orbit.upload_not_ready', `This upload is ${status}; only a previewed upload can be imported or cancelled.`);
export const fileTooLarge = (limitBytes: number) =>
  new AppError(
    413,
    'orbit.file_too_large',
    `The file is larger than the ${formatBytes(limitBytes)} limit for element-set uploads. Split it into smaller files.`,
  );
export const emptyUpload = () => badRequest('orbit.empty_upload', 'Choose a file or paste some element sets: the upload was empty.');
export const notText = (why: string) =>
  new AppError(
    415,
    'orbit.not_text',
    `This file is not text (${why}). Upload two-/three-line element sets or CCSDS OMM (KVN, XML, JSON or CSV).`,
  );
export const unrecognisedFormat = (firstLine: string) =>
  new AppError(
    415,
    'orbit.unrecognised_format',
    `The file is text, but not an element-set format we read. Line 1 starts "${firstLine}"; expected two-/three-line element sets or CCSDS OMM (KVN, XML, JSON or CSV).`,
  );
export const sailingPeriodNotFound = () => notFound('orbit.sailing_period_not_found', 'No sailing period with this id.');
/** Names the period in the way, and the trim that would make the new one fit (or that none would). */
export const sailingPeriodOverlap = (
  requested: { startMs: number; endMs: number },
  other: { mode: string; startMs: number; endMs: number },
  trim: { startMs: number; endMs: number } | null,
) => {
  const span = `${formatUtcDateTime(other.startMs)} – ${formatUtcDateTime(other.endMs)}`;
  const offer = trim
    ? ` Trim this period to ${formatUtcDateTime(trim.startMs)} – ${formatUtcDateTime(trim.endMs)}, or change the ${other.mode} period first.`
    : ` No part of this period is free: change or delete the ${other.mode} period first.`;
  const field = requested.startMs >= other.startMs && requested.startMs < other.endMs ? 'startAt' : 'endAt';
  return new AppError(409, 'orbit.sailing_period_overlap', `This period overlaps the ${other.mode} period ${span}.${offer}`, [
    { path: field, message: `overlaps the ${other.mode} period ${span}` },
  ]);
};
export const snapshotNotFound = () => notFound('orbit.snapshot_not_found', 'No snapshot with this id.');
export const snapshotNotYours = () =>
  new AppError(403, 'orbit.snapshot_not_yours', 'Only the engineer who saved this snapshot (or an admin) may change it.');
export const fileNotFound = () => notFound('orbit.file_not_found', 'No element-set file with this id.');

export function formatBytes(bytes: number): string {
  if (bytes >= 1024 * 1024) return `${+(bytes / (1024 * 1024)).toFixed(1)} MB`;
  if (bytes >= 1024) return `${+(bytes / 1024).toFixed(1)} KB`;
  return `${bytes} bytes`;
}
