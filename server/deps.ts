import Stripe from 'stripe';
import { Resend } from 'resend';
import type { Config } from './config';
import { createMailer } from '../emails/send';
import type { Mailer } from './lib/mailer';

// The hosted-service clients, built from config: the real SDKs, pointed wherever config says.
export function createMailerFromConfig(config: Config): Mailer {
  const resend = new Resend(config.RESEND_API_KEY, { baseUrl: config.RESEND_BASE_URL });
  return createMailer({ resend, from: config.MAIL_FROM });
}

export function createStripeFromConfig(config: Config): Stripe {
  if (!config.STRIPE_API_BASE_URL) return new Stripe(config.STRIPE_SECRET_KEY, { maxNetworkRetries: 2 });
  const u = new URL(config.STRIPE_API_BASE_URL);
  return new Stripe(config.STRIPE_SECRET_KEY, {
    host: u.hostname,
    port: Number(u.port) || (u.protocol === 'https:' ? 443 : 80),
    protocol: u.protocol.replace(':', '') as 'http' | 'https',
    maxNetworkRetries: 2,
  });
}
