import express, { Router } from 'express';
import type Stripe from 'stripe';
import type { Config } from '../../config';
import { badRequest } from '../../errors';
import type { PaymentsService } from './payments.service';

/**
 * The processor's webhook. Mounted before the JSON parser: the signature covers the raw bytes. A forged or
 * stale signature is refused before anything is read or recorded.
 */
export function createPaymentsWebhookRouter({ payments, stripe, config }: { payments: PaymentsService; stripe: Stripe; config: Config }) {
  const router = Router();
  router.post('/webhook', express.raw({ type: () => true, limit: '1mb' }), async (req, res) => {
    const signature = req.headers['stripe-signature'];
    if (typeof signature !== 'string' || !Buffer.isBuffer(req.body)) {
      throw badRequest('payments.signature_missing', 'A webhook needs its Stripe-Signature header and a raw body.');
    }
    let event: Stripe.Event;
    try {
      event = stripe.webhooks.constructEvent(req.body, signature, config.STRIPE_WEBHOOK_SECRET);
    } catch {
      throw badRequest('payments.signature_invalid', 'The webhook signature does not match this endpoint’s secret.');
    }
    // Events that are not ours are acknowledged too (a shared account must not retry them forever).
    const outcome = await payments.handle(event);
    res.json({ received: true, outcome });
  });
  return router;
}
