import pino from 'pino';
import { loadConfig, ConfigError } from './config';
import { createDb } from './db/client';
import { createApp, defaultClientDir } from './app';
import { createMailerFromConfig, createStripeFromConfig } from './deps';

let config;
try {
  config = loadConfig();
} catch (err) {
  if (err instanceof ConfigError) {
    process.stderr.write(`${err.message}\n`);
    process.exit(1);
  }
  throw err;
}

const logger = pino({ level: config.LOG_LEVEL });
const { db, pool } = createDb(config.DATABASE_URL, {
  max: config.DATABASE_POOL_MAX,
  connectTimeoutMs: config.DATABASE_CONNECT_TIMEOUT_MS,
  statementTimeoutMs: config.DATABASE_STATEMENT_TIMEOUT_MS,
});
const app = createApp({
  db,
  pool,
  config,
  logger,
  mailer: createMailerFromConfig(config),
  stripe: createStripeFromConfig(config),
  clientDir: defaultClientDir,
});

const server = app.listen(config.PORT, config.HOST, () => {
  logger.info(`Lightkeel listening on http://${config.HOST}:${config.PORT}`);
});

let closing = false;
function shutdown(signal: string) {
  if (closing) return;
  closing = true;
  logger.info({ signal }, 'shutting down');
  server.close(() => {
    pool.end().finally(() => process.exit(0));
  });
  setTimeout(() => process.exit(0), 5000).unref();
}
process.on('SIGINT', () => shutdown('SIGINT'));
process.on('SIGTERM', () => shutdown('SIGTERM'));
