import path from 'node:path';
import type { Config } from '../../server/config';

export type RunningFakes = { urls: [string, string][]; close: () => Promise<void> };

const portOf = (url: string, fallback: number) => {
  try {
    return Number(new URL(url).port) || fallback;
  } catch {
    return fallback;
  }
};

/** Starts the loopback stand-ins for the hosted services on the ports the config points at. */
export async function startFakes(config: Config, say: (m: string) => void): Promise<RunningFakes> {
  const urls: [string, string][] = [];
  const closers: Array<() => Promise<void>> = [];
  const data = path.resolve('.data');

  if (config.GOOGLE_OAUTH_BASE_URL) {
    const { createIdentityFake } = await import('../../fakes/identity/server');
    const idp = await createIdentityFake({ port: portOf(config.GOOGLE_OAUTH_BASE_URL, 4010) });
    urls.push(['identity (fake)', idp.issuerUrl]);
    closers.push(() => idp.close());
  }
  {
    const { createMailFake } = await import('../../fakes/mail/server');
    const mail = await createMailFake({
      port: portOf(config.RESEND_BASE_URL, 4020),
      apiKey: config.RESEND_API_KEY,
      statePath: path.join(data, 'mail-fake.json'),
    });
    urls.push(['outbox (mail fake)', `${mail.url}/outbox`]);
    closers.push(() => mail.close());
  }
  if (config.STRIPE_API_BASE_URL) {
    const { createPaymentsFake } = await import('../../fakes/payments/server');
    const pay = await createPaymentsFake({
      port: portOf(config.STRIPE_API_BASE_URL, 4030),
      apiKey: config.STRIPE_SECRET_KEY,
      webhookSecret: config.STRIPE_WEBHOOK_SECRET,
      webhookUrl: `${config.PUBLIC_URL}/api/payments/webhook`,
      statePath: path.join(data, 'payments-fake.json'),
    });
    urls.push(['payments (fake)', pay.url]);
    closers.push(() => pay.close());
    // Demo: on a fresh processor, one payment it took that never reached the ledger (as if its webhook had been
    // lost), so finance's first reconciliation of the demo month has a finding to work through.
    const { createStripeFromConfig } = await import('../../server/deps');
    const stripe = createStripeFromConfig(config);
    if ((await stripe.charges.list({ limit: 1 })).data.length === 0) {
      const res = await fetch(`${pay.url}/_fake/seed/charges`, {
        method: 'POST',
        headers: { 'content-type': 'application/json' },
        body: JSON.stringify({ count: 1, amountMinor: 4200, currency: 'usd' }),
      });
      if (!res.ok) throw new Error(`payments fake: seeding the demo payment answered ${res.status}`);
      say('demo: the payment fake holds one $42.00 payment the ledger never saw (a finding for the first reconciliation)');
    }
  }
  say(`local fakes up: ${urls.map(([n]) => n).join(', ')}`);
  return { urls, close: async () => void (await Promise.all(closers.map((c) => c().catch(() => undefined)))) };
}
