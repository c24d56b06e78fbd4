import { Router } from 'express';
import { z } from 'zod';
import { validated } from '../../middleware/validate';
import { safeText } from '../../../shared/schemas/text';
import { requireRole } from '../../middleware/auth';
import type { CampaignsService } from './campaigns.service';
import { stretchTargetsSchema, tierInputSchema, updateCampaignSchema } from '../../../shared/schemas/campaign';
import { budgetLinesSchema } from '../../../shared/schemas/budget-lines';

const slugParams = z.object({ slug: safeText().regex(/^[a-z0-9-]{1,80}$/, 'must be a campaign slug') });
const tierParams = slugParams.extend({ tierId: z.uuid({ message: 'must be a tier id' }) });

export function createCampaignsRouter({ campaigns }: { campaigns: CampaignsService }) {
  const router = Router();
  const staff = requireRole('outreach', 'admin');

  router.get('/', async (_req, res) => {
    res.json({ campaigns: await campaigns.list() });
  });

  router.get(
    '/:slug',
    validated({ params: slugParams }, async (_req, res, { params }) => {
      res.set('Cache-Control', 'public, max-age=5');
      res.json({ campaign: await campaigns.view(params.slug) });
    }),
  );

  router.get(
    '/:slug/backers',
    validated(
      { params: slugParams, query: z.object({ limit: z.coerce.number().int().min(1).max(100).default(20) }) },
      async (_req, res, { params, query }) => {
        res.json({ backers: await campaigns.backers(params.slug, query.limit) });
      },
    ),
  );

  // Staff: the same campaign with inactive tiers, uncached, for the console form.
  router.get(
    '/:slug/manage',
    staff,
    validated({ params: slugParams }, async (_req, res, { params }) => {
      res.json({ campaign: await campaigns.view(params.slug, { fresh: true, includeInactive: true }) });
    }),
  );

  router.patch(
    '/:slug',
    staff,
    validated({ params: slugParams, body: updateCampaignSchema }, async (req, res, { params, body }) => {
      res.json({ campaign: await campaigns.update({ actorId: req.user!.id, slug: params.slug, input: body }) });
    }),
  );

  router.post(
    '/:slug/tiers',
    staff,
    validated({ params: slugParams, body: tierInputSchema }, async (req, res, { params, body }) => {
      res.status(201).json({ tier: await campaigns.createTier({ actorId: req.user!.id, slug: params.slug, input: body }) });
    }),
  );

  router.patch(
    '/:slug/tiers/:tierId',
    staff,
    validated({ params: tierParams, body: tierInputSchema }, async (req, res, { params, body }) => {
      res.json({ tier: await campaigns.updateTier({ actorId: req.user!.id, slug: params.slug, tierId: params.tierId, input: body }) });
    }),
  );

  router.put(
    '/:slug/stretch-targets',
    staff,
    validated({ params: slugParams, body: stretchTargetsSchema }, async (req, res, { params, body }) => {
      res.json({ campaign: await campaigns.replaceStretchTargets({ actorId: req.user!.id, slug: params.slug, input: body }) });
    }),
  );

  router.put(
    '/:slug/budget-lines',
    staff,
    validated({ params: slugParams, body: budgetLinesSchema }, async (req, res, { params, body }) => {
      res.json({ campaign: await campaigns.replaceBudgetLines({ actorId: req.user!.id, slug: params.slug, input: body }) });
    }),
  );

  return router;
}
