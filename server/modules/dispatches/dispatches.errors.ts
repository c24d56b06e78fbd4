import { AppError, badRequest, conflict, notFound } from '../../errors';
import { DISPATCH_STATE_LABEL, type DispatchState } from '../../../shared/schemas/dispatch';

// The dispatch desk's errors, each with a stable code.
export const dispatchNotFound = () => notFound('dispatches.not_found', 'There is no such dispatch.');
export const badTransition = (from: DispatchState, to: DispatchState, allowed: readonly DispatchState[]) =>
  conflict(
    'dispatches.bad_transition',
    `A ${DISPATCH_STATE_LABEL[from].toLowerCase()} dispatch cannot become ${DISPATCH_STATE_LABEL[to].toLowerCase()}; from here it can become: ${
      allowed.map((s) => DISPATCH_STATE_LABEL[s].toLowerCase()).join(', ') || 'nothing'
    }.`,
  );
export const snapshotMissing = (index: number) =>
  badRequest('dispatches.snapshot_not_found', `Chart ${index + 1}: that snapshot no longer exists on the orbit desk.`, [
    { path: `charts.${index}.snapshotId`, message: 'no snapshot with this id' },
  ]);
export const tierMissing = (ids: string[]) =>
  badRequest('dispatches.tier_not_found', `These tiers do not exist: ${ids.join(', ')}.`, [
    { path: 'audience.tierIds', message: 'unknown tier' },
  ]);
export const jobsUnavailable = () =>
  new AppError(503, 'dispatches.jobs_unavailable', 'Scheduling needs the background workers, which this server was started without.');
export const alreadyEmailed = () => conflict('dispatches.already_emailed', 'This dispatch has already been e-mailed to its audience.');
export const notPublished = () => conflict('dispatches.not_published', 'Only a published dispatch can be e-mailed.');

export const imageTooLarge = (limitBytes: number) =>
  new AppError(
    413,
    'dispatches.image_too_large',
    `The image is larger than ${(limitBytes / 1024 / 1024).toFixed(1)} MB. Export it smaller (for example 2400 pixels wide, JPEG quality 80).`,
  );
export const imageNotSupported = (why: string) =>
  new AppError(415, 'dispatches.image_type', `This file is not a PNG, JPEG, WebP or GIF image (${why}).`);
export const imageTooManyPixels = (w: number, h: number, max: number) =>
  badRequest(
    'dispatches.image_pixels',
    `The image is ${w} × ${h} pixels (${((w * h) / 1e6).toFixed(1)} megapixels); the limit is ${(max / 1e6).toFixed(0)} megapixels. Scale it down.`,
    [{ path: 'file', message: 'too many pixels' }],
  );
export const imageMissing = () =>
  badRequest('dispatches.image_missing', 'Choose an image file to upload (field "file").', [{ path: 'file', message: 'required' }]);
export const heroAltInvalid = (message: string) =>
  badRequest('dispatches.hero_alt', `The hero image needs a description: ${message.charAt(0).toLowerCase()}${message.slice(1)}.`, [
    { path: 'alt', message },
  ]);
