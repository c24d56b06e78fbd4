import { createMailFake } from './server';

// Local stand-in for the mail service: `tsx fakes/mail/index.ts`.
const port = Number(process.env.MAIL_FAKE_PORT ?? 4020);
if (!Number.isInteger(port) || port < 0 || port > 65535) {
  console.error(`MAIL_FAKE_PORT must be a port number, got "${process.env.MAIL_FAKE_PORT}"`);
  process.exit(1);
}
const apiKey = process.env.RESEND_API_KEY || 're_lightkeel_local';
const statePath = process.env.MAIL_FAKE_STATE || '.data/mail-fake.json';

const fake = await createMailFake({ port, apiKey, statePath });
console.log(`mail fake listening on ${fake.url} (outbox: ${fake.url}/outbox, state: ${statePath})`);

let stopping = false;
async function stop(signal: string) {
  if (stopping) return;
  stopping = true;
  await fake.close();
  console.log(`mail fake stopped (${signal})`);
  process.exit(0);
}
process.on('SIGTERM', () => void stop('SIGTERM'));
process.on('SIGINT', () => void stop('SIGINT'));
