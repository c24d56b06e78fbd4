// `tsx fakes/payments/index.ts`: runs the payments fake on its own (npm start uses scripts/lib/fakes.ts).
import path from 'node:path';
import { createPaymentsFake } from './server';

const port = Number(process.env.PAYMENTS_FAKE_PORT ?? 4030);
if (!Number.isInteger(port) || port < 0 || port > 65535) {
  process.stderr.write(`PAYMENTS_FAKE_PORT must be a port number, got "${process.env.PAYMENTS_FAKE_PORT}"\n`);
  process.exit(1);
}

const fake = await createPaymentsFake({
  port,
  statePath: path.resolve(process.env.PAYMENTS_FAKE_STATE ?? '.data/payments-fake.json'),
  webhookUrl: process.env.PAYMENTS_WEBHOOK_URL ?? 'http://127.0.0.1:3000/api/payments/webhook',
  webhookSecret: process.env.STRIPE_WEBHOOK_SECRET ?? 'whsec_lightkeel_local',
  apiKey: process.env.STRIPE_SECRET_KEY ?? 'sk_test_lightkeel_local',
  ...(process.env.PAYMENTS_FAKE_PUBLIC_URL ? { publicBaseUrl: process.env.PAYMENTS_FAKE_PUBLIC_URL } : {}),
  log: process.env.PAYMENTS_FAKE_LOG !== '0',
});
console.log(`payments fake on ${fake.url} (state ${process.env.PAYMENTS_FAKE_STATE ?? '.data/payments-fake.json'})`);

let stopping = false;
for (const signal of ['SIGTERM', 'SIGINT'] as const) {
  process.on(signal, () => {
    if (stopping) return;
    stopping = true;
    void fake.close().then(
      () => process.exit(0),
      (err: unknown) => {
        process.stderr.write(`payments fake: error while closing: ${String(err)}\n`);
        process.exit(1);
      },
    );
  });
}
