import { Router } from 'express';
import { validated } from '../../middleware/validate';
import type { Db } from '../../db/client';
import type { Config } from '../../config';
import { unsubscribeSchema } from '../../../shared/schemas/dispatch';
import { applyUnsubscribe } from './unsubscribe';

/**
 * Signed-link e-mail choices, without signing in. POST /unsubscribe is also the RFC 8058 one-click target a
 * mail client calls with the body "List-Unsubscribe=One-Click"; the token in the URL is the authority (no
 * session, so no CSRF token either).
 */
export function createEmailChoicesRouter({ db, config }: { db: Db; config: Config }) {
  const router = Router();
  router.post(
    '/unsubscribe',
    validated({ query: unsubscribeSchema }, async (_req, res, { query }) => {
      res.set('Cache-Control', 'no-store').json(await applyUnsubscribe(db, config.SESSION_SECRET, query.token, false));
    }),
  );
  router.post(
    '/resubscribe',
    validated({ query: unsubscribeSchema }, async (_req, res, { query }) => {
      res.set('Cache-Control', 'no-store').json(await applyUnsubscribe(db, config.SESSION_SECRET, query.token, true));
    }),
  );
  return router;
}
