import { Router } from 'express';
import { z } from 'zod';
import { validated } from '../../middleware/validate';
import { requireAuth } from '../../middleware/auth';
import type { MySupportService } from './my-support.service';
import { deleteAccountSchema, emailPreferencesSchema } from '../../../shared/schemas/campaign';

const membershipParams = z.object({ id: z.uuid({ message: 'must be a membership id' }) });
const receiptParams = z.object({ entryId: z.coerce.number().int().positive({ message: 'must be a payment number' }) });

export function createMySupportRouter({ mySupport }: { mySupport: MySupportService }) {
  const router = Router();
  router.use(requireAuth);

  router.get('/pledges', async (req, res) => {
    res.set('Cache-Control', 'no-store');
    res.json({ pledges: await mySupport.pledges(req.user!.id) });
  });

  router.get('/memberships', async (req, res) => {
    res.set('Cache-Control', 'no-store');
    res.json({ memberships: await mySupport.memberships(req.user!.id) });
  });

  router.post(
    '/memberships/:id/cancel',
    validated({ params: membershipParams }, async (req, res, { params }) => {
      res.json({ membership: await mySupport.cancelMembership(req.user!.id, params.id) });
    }),
  );

  router.post(
    '/memberships/:id/resume',
    validated({ params: membershipParams }, async (req, res, { params }) => {
      res.json({ membership: await mySupport.resumeMembership(req.user!.id, params.id) });
    }),
  );

  router.post(
    '/memberships/:id/card',
    validated({ params: membershipParams }, async (req, res, { params }) => {
      res.json({ url: await mySupport.cardUpdateUrl(req.user!.id, params.id) });
    }),
  );

  router.get(
    '/receipts/:entryId',
    validated({ params: receiptParams }, async (req, res, { params }) => {
      res.json({ receipt: await mySupport.receipt(req.user!, params.entryId) });
    }),
  );

  router.get('/email-preferences', async (req, res) => {
    res.json({ preferences: await mySupport.emailPreferences(req.user!.id) });
  });

  router.put(
    '/email-preferences',
    validated({ body: emailPreferencesSchema }, async (req, res, { body }) => {
      res.json({ preferences: await mySupport.setEmailPreferences(req.user!.id, body) });
    }),
  );

  router.get('/export', async (req, res) => {
    const data = await mySupport.exportData(req.user!.id);
    res.set('Cache-Control', 'no-store');
    res.attachment(`lightkeel-my-data-${new Date().toISOString().slice(0, 10)}.json`);
    res.type('application/json').send(JSON.stringify(data, null, 2));
  });

  router.delete(
    '/account',
    validated({ body: deleteAccountSchema }, async (req, res, { body }) => {
      await mySupport.deleteAccount(req.user!, body.confirmEmail);
      req.logout(() => {
        req.session.destroy(() => {
          res.clearCookie('lk.sid');
          res.status(204).end();
        });
      });
    }),
  );

  return router;
}
