import { Router } from 'express';
import { z } from 'zod';
import { validated } from '../../middleware/validate';
import type { DispatchesService } from './dispatches.service';
import { StorageKeyError } from '../../lib/storage';
import { notFound } from '../../errors';

const slugParams = z.object({ slug: z.string().regex(/^[a-z0-9-]{1,80}$/, { message: 'must be a dispatch link' }) });

const viewerOf = (req: { user?: { id: string; roles: readonly string[] } }) =>
  req.user ? { id: req.user.id, roles: req.user.roles as never } : null;

/** Anyone: the feed and the dispatch pages (a dispatch for an audience the reader is not in answers "for backers"). */
export function createPublicDispatchesRouter({ dispatches }: { dispatches: DispatchesService }) {
  const router = Router();
  router.get('/', async (req, res) => {
    res.set('Cache-Control', 'no-store').json({ dispatches: await dispatches.feed(viewerOf(req)) });
  });
  router.get(
    '/:slug',
    validated({ params: slugParams }, async (req, res, { params }) => {
      res.set('Cache-Control', 'no-store').json({ dispatch: await dispatches.page(viewerOf(req), params.slug) });
    }),
  );
  return router;
}

/** Stored images (hero images, frozen charts) under unguessable keys, so mail clients can load them. */
export function createFilesRouter({ dispatches }: { dispatches: DispatchesService }) {
  const router = Router();
  router.get('/*key', async (req, res) => {
    const parts = req.params.key;
    const key = Array.isArray(parts) ? parts.join('/') : String(parts);
    let file;
    try {
      file = await dispatches.file(key);
    } catch (err) {
      if (err instanceof StorageKeyError) throw notFound('files.not_found', 'No such file.');
      throw err;
    }
    if (!file) throw notFound('files.not_found', 'No such file.');
    res
      .set('Cache-Control', 'public, max-age=31536000, immutable')
      .set('Content-Disposition', 'inline')
      // These images are shown inside e-mail, on a mail client's own origin: helmet's default (same-origin)
      // would make a browser-based mail client refuse to draw them.
      .set('Cross-Origin-Resource-Policy', 'cross-origin')
      .type(file.contentType)
      .send(file.bytes);
  });
  return router;
}
