import type { ErrorRequestHandler, RequestHandler } from 'express';
import { randomUUID } from 'node:crypto';
import { ZodError } from 'zod';
import { AppError } from '../errors';
import { classifyDatabaseError, DATABASE_RETRY_AFTER_SECONDS } from '../db/errors';

export const notFoundApi: RequestHandler = (req, res) => {
  res.status(404).json({ error: { code: 'not_found', message: `No API route ${req.method} ${req.path}` } });
};

export const errorHandler: ErrorRequestHandler = (err, req, res, _next) => {
  if (res.headersSent) return;
  if (err instanceof ZodError) {
    const details = err.issues.map((i) => ({ path: i.path.join('.'), message: i.message }));
    res.status(400).json({
      error: {
        code: 'validation_failed',
        message: details.map((d) => (d.path ? `${d.path}: ${d.message}` : d.message)).join('; '),
        details,
      },
    });
    return;
  }
  if (err instanceof AppError) {
    if (err.headers) res.set(err.headers);
    // A failure on our side (5xx) gets an id the user can quote and that the log holds.
    const errorId = err.status >= 500 ? randomUUID() : undefined;
    if (errorId) req.log?.error({ err, errorId }, err.code);
    res.status(err.status).json({
      error: { code: err.code, message: err.message, ...(err.details ? { details: err.details } : {}), ...(errorId ? { errorId } : {}) },
    });
    return;
  }
  // body-parser, multer and csrf-sync errors carry a status or a code of their own.
  const e = err as { type?: string; status?: number; code?: string; message?: string };
  if (e.type === 'entity.parse.failed') {
    res.status(400).json({ error: { code: 'request.bad_json', message: 'The request body is not valid JSON.' } });
    return;
  }
  if (e.type === 'entity.too.large' || e.code === 'LIMIT_FILE_SIZE') {
    res.status(413).json({ error: { code: 'request.too_large', message: 'The request is larger than this server accepts.' } });
    return;
  }
  if (e.code === 'EBADCSRFTOKEN') {
    res.status(403).json({ error: { code: 'csrf.invalid', message: 'This form has expired; reload the page and try again.' } });
    return;
  }
  if (typeof e.status === 'number' && e.status >= 400 && e.status < 500) {
    res.status(e.status).json({ error: { code: 'request.invalid', message: e.message ?? 'Bad request.' } });
    return;
  }
  const errorId = randomUUID();
  const kind = classifyDatabaseError(err);
  if (kind === 'unavailable') {
    // The database is down, refusing connections, or a statement ran out of time (a lock held too long):
    // the request may succeed later, so say when to try again.
    req.log?.error({ err, errorId }, 'database unavailable');
    res
      .status(503)
      .set('Retry-After', String(DATABASE_RETRY_AFTER_SECONDS))
      .json({
        error: {
          code: 'service_unavailable',
          message: 'Lightkeel cannot reach its records right now. Nothing was changed; try again in a moment.',
          errorId,
        },
      });
    return;
  }
  if (kind === 'bad_value') {
    // A value the database refuses (SQLSTATE class 22) that the input schemas let through: the request is at fault.
    req.log?.warn({ err, errorId }, 'database refused a value');
    res.status(400).json({
      error: {
        code: 'request.bad_value',
        message: 'A value in the request could not be stored (it holds characters or a number the database refuses). Nothing was changed.',
        errorId,
      },
    });
    return;
  }
  req.log?.error({ err, errorId }, 'unhandled error');
  res
    .status(500)
    .json({ error: { code: 'internal', message: 'Something went wrong on our side. Quote this id if you report it.', errorId } });
};
