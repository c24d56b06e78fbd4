import { Router, type RequestHandler } from 'express';
import multer from 'multer';
import { z } from 'zod';
import { validated } from '../../middleware/validate';
import { requireRole } from '../../middleware/auth';
import { AppError } from '../../errors';
import { renderMarkdownSchema, saveDispatchSchema, transitionDispatchSchema } from '../../../shared/schemas/dispatch';
import type { DispatchesService } from './dispatches.service';
import type { DispatchSending } from './dispatch-sending';
import { imageTooLarge } from './dispatches.errors';

const idParams = z.object({ id: z.uuid({ message: 'must be a dispatch id' }) });
const retrySchema = z.object({
  mailIds: z
    .array(z.union([z.number().int(), z.string().min(1).max(64)]))
    .max(10_000)
    .optional(),
});

function heroUpload(limitBytes: number): RequestHandler {
  // One byte over the limit is enough to know the file is too large; the check itself names the limit.
  const upload = multer({ storage: multer.memoryStorage(), limits: { fileSize: limitBytes + 1, files: 1, fields: 2 } }).single('file');
  return (req, res, next) => {
    upload(req, res, (err: unknown) => {
      if (!err) return next();
      if ((err as { code?: string }).code === 'LIMIT_FILE_SIZE') return next(imageTooLarge(limitBytes));
      return next(
        new AppError(
          400,
          'dispatches.bad_upload',
          `The upload could not be read (${(err as Error).message}). Send one image in the field "file".`,
        ),
      );
    });
  };
}

/** Outreach and admin: the dispatch desk. */
export function createDispatchesRouter({
  dispatches,
  sending,
  heroLimitBytes,
}: {
  dispatches: DispatchesService;
  sending: DispatchSending;
  heroLimitBytes: number;
}) {
  const router = Router();
  router.use(requireRole('outreach', 'admin'));

  router.get('/', async (_req, res) => {
    res.set('Cache-Control', 'no-store').json({ dispatches: await dispatches.list() });
  });
  router.post(
    '/',
    validated({ body: saveDispatchSchema }, async (req, res, { body }) => {
      res.status(201).json({ dispatch: await dispatches.create(req.user!, body) });
    }),
  );
  router.post(
    '/preview',
    validated({ body: renderMarkdownSchema }, async (_req, res, { body }) => {
      res.json(dispatches.preview(body.markdown));
    }),
  );
  router.get(
    '/:id',
    validated({ params: idParams }, async (_req, res, { params }) => {
      res.set('Cache-Control', 'no-store').json({ dispatch: await dispatches.get(params.id), heroLimits: { maxBytes: heroLimitBytes } });
    }),
  );
  router.put(
    '/:id',
    validated({ params: idParams, body: saveDispatchSchema }, async (req, res, { params, body }) => {
      res.json({ dispatch: await dispatches.update(req.user!, params.id, body) });
    }),
  );
  router.post(
    '/:id/transition',
    validated({ params: idParams, body: transitionDispatchSchema }, async (req, res, { params, body }) => {
      res.json({ dispatch: await dispatches.transition(req.user!, params.id, body) });
    }),
  );
  router.post(
    '/:id/hero',
    heroUpload(heroLimitBytes),
    validated({ params: idParams }, async (req, res, { params }) => {
      res.json({ dispatch: await dispatches.setHero(req.user!, params.id, req.file?.buffer, req.body?.alt) });
    }),
  );
  router.delete(
    '/:id/hero',
    validated({ params: idParams }, async (req, res, { params }) => {
      res.json({ dispatch: await dispatches.removeHero(req.user!, params.id) });
    }),
  );
  router.post(
    '/:id/email',
    validated({ params: idParams }, async (req, res, { params }) => {
      res.status(202).json({ dispatch: await dispatches.email(req.user!, params.id) });
    }),
  );
  router.get(
    '/:id/versions',
    validated({ params: idParams }, async (_req, res, { params }) => {
      res.json({ versions: await dispatches.versions(params.id) });
    }),
  );
  router.get(
    '/:id/progress',
    validated({ params: idParams }, async (_req, res, { params }) => {
      await dispatches.load(params.id);
      res.set('Cache-Control', 'no-store').json({ progress: await sending.progress(params.id) });
    }),
  );
  router.post(
    '/:id/retry',
    validated({ params: idParams, body: retrySchema }, async (_req, res, { params, body }) => {
      await dispatches.load(params.id);
      res.status(202).json({ retried: await sending.retryFailed(params.id, body.mailIds) });
    }),
  );
  return router;
}
