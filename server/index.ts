import pino from 'pino';
import { loadConfig, ConfigError } from './config';
import { createDb } from './db/client';
import { createApp, defaultClientDir } from './app';
import { createMailerFromConfig, createStripeFromConfig } from './deps';
import { createJobs } from './jobs';

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
const { db, pool } = createDb(config.DATABASE_URL, { max: config.DATABASE_POOL_MAX });
// The web process only enqueues; workers run in their own processes (server/worker.ts).
const jobs = createJobs({ pool, db, config, logger });
await jobs.start();
const app = createApp({
  db,
  pool,
  config,
  logger,
  mailer: createMailerFromConfig(config),
  stripe: createStripeFromConfig(config),
  jobs,
  clientDir: defaultClientDir,
});

const server = app.listen(config.PORT, config.HOST, () => {
  logger.info(`Lightkeel listening on http://${config.HOST}:${config.PORT}`);
  process.send?.({ ready: 'web' });
});

let closing = false;
function shutdown(signal: string) {
  if (closing) return;
  closing = true;
  logger.info({ signal }, 'shutting down');
  server.close(() => {
    jobs
      .stop()
      .catch(() => undefined)
      .finally(() => pool.end().finally(() => process.exit(0)));
  });
  setTimeout(() => process.exit(0), 5000).unref();
}
process.on('SIGINT', () => shutdown('SIGINT'));
process.on('SIGTERM', () => shutdown('SIGTERM'));
