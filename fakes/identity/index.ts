import { createIdentityFake, googleEndpoints } from './server';

// Local stand-in for Google sign-in: `tsx fakes/identity/index.ts`.
const port = Number(process.env.IDENTITY_FAKE_PORT ?? 4010);
if (!Number.isInteger(port) || port < 0 || port > 65535) {
  console.error(`IDENTITY_FAKE_PORT must be a port number, got "${process.env.IDENTITY_FAKE_PORT}"`);
  process.exit(1);
}

const fake = await createIdentityFake({ port });
const endpoints = googleEndpoints(fake.issuerUrl);
console.log(
  `identity fake listening on ${fake.issuerUrl} (authorize ${endpoints.authorizationURL}, token ${endpoints.tokenURL}, userinfo ${endpoints.userProfileURL})`,
);

let stopping = false;
async function stop(signal: string) {
  if (stopping) return;
  stopping = true;
  await fake.close();
  console.log(`identity fake stopped (${signal})`);
  process.exit(0);
}
process.on('SIGTERM', () => void stop('SIGTERM'));
process.on('SIGINT', () => void stop('SIGINT'));
