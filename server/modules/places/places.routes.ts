import { Router } from 'express';
import { z } from 'zod';
import { validated } from '../../middleware/validate';
import { requireAuth } from '../../middleware/auth';
import type { PlacesService } from './places.service';
import { passRemindersSchema, savePlaceSchema } from '../../../shared/schemas/places';

const placeParams = z.object({ id: z.uuid({ message: 'must be a place id' }) });

/** /api/my-support/places: the backer's saved sky-watch places and the pass-reminder choice. */
export function createPlacesRouter({ places }: { places: PlacesService }) {
  const router = Router();
  router.use(requireAuth);

  router.get('/', async (req, res) => {
    res.set('Cache-Control', 'no-store').json(await places.list(req.user!.id));
  });

  router.post(
    '/',
    validated({ body: savePlaceSchema }, async (req, res, { body }) => {
      res.status(201).json({ place: await places.save(req.user!.id, body) });
    }),
  );

  router.put(
    '/reminders',
    validated({ body: passRemindersSchema }, async (req, res, { body }) => {
      res.json(await places.setPassReminders(req.user!.id, body.enabled));
    }),
  );

  router.delete(
    '/:id',
    validated({ params: placeParams }, async (req, res, { params }) => {
      await places.remove(req.user!.id, params.id);
      res.status(204).end();
    }),
  );

  return router;
}
