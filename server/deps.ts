import { Resend } from 'resend';
import type { Config } from './config';
import { createMailer } from '../emails/send';
import type { Mailer } from './lib/mailer';

// The hosted-service clients, built from config: the real SDKs, pointed wherever config says.
export function createMailerFromConfig(config: Config): Mailer {
  const resend = new Resend(config.RESEND_API_KEY, { baseUrl: config.RESEND_BASE_URL });
  return createMailer({ resend, from: config.MAIL_FROM });
}
