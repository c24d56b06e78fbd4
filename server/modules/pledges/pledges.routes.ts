import { Router } from 'express';
import { z } from 'zod';
import { validated } from '../../middleware/validate';
import { requireAuth } from '../../middleware/auth';
import type { PledgesService } from './pledges.service';
import { createPledgeSchema, retryPledgeSchema } from '../../../shared/schemas/campaign';

const idParams = z.object({ id: z.uuid({ message: 'must be a pledge id' }) });

export function createPledgesRouter({ pledges }: { pledges: PledgesService }) {
  const router = Router();

  router.post(
    '/',
    requireAuth,
    validated({ body: createPledgeSchema }, async (req, res, { body }) => {
      const result = await pledges.create({ account: req.user!, input: body });
      // 202: the pledge stands and its checkout is still being opened by an earlier submit; GET it for the link.
      const status = result.checkoutUrl === null ? 202 : result.replayed ? 200 : 201;
      res.status(status).json({ pledge: result.pledge, checkoutUrl: result.checkoutUrl });
    }),
  );

  router.get(
    '/:id',
    requireAuth,
    validated({ params: idParams }, async (req, res, { params }) => {
      res.set('Cache-Control', 'no-store');
      res.json({ pledge: await pledges.get(req.user!.id, params.id) });
    }),
  );

  router.post(
    '/:id/again',
    requireAuth,
    validated({ params: idParams, body: retryPledgeSchema }, async (req, res, { params, body }) => {
      const result = await pledges.retry({ account: req.user!, pledgeId: params.id, attemptKey: body.attemptKey });
      const status = result.checkoutUrl === null ? 202 : result.replayed ? 200 : 201;
      res.status(status).json({ pledge: result.pledge, checkoutUrl: result.checkoutUrl });
    }),
  );

  router.post(
    '/:id/cancel',
    requireAuth,
    validated({ params: idParams }, async (req, res, { params }) => {
      res.json({ pledge: await pledges.cancel(req.user!.id, params.id) });
    }),
  );

  return router;
}
