// `npm run worker`: runs the background workers alone (no web server). Start as many as you like against the
// same DATABASE_URL; pg-boss hands each job to one of them. SIGINT/SIGTERM: finish running jobs, then exit.
import pino from 'pino';
import { loadConfig, ConfigError } from './config';
import { createDb } from './db/client';
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

const logger = pino({ level: config.LOG_LEVEL }).child({ process: 'worker' });
const { db, pool } = createDb(config.DATABASE_URL, { max: config.DATABASE_POOL_MAX });
const jobs = createJobs({ pool, db, config, logger, worker: true });
await jobs.start();
await jobs.work();
logger.info({ pid: process.pid }, 'worker ready');
process.send?.({ ready: 'worker' });

let closing = false;
async function shutdown(signal: string) {
  if (closing) return;
  closing = true;
  logger.info({ signal }, 'worker stopping: waiting for running jobs');
  try {
    await jobs.stop();
  } catch (err) {
    logger.error({ err }, 'worker stop failed');
  }
  await pool.end().catch(() => undefined);
  process.exit(0);
}
process.on('SIGINT', () => void shutdown('SIGINT'));
process.on('SIGTERM', () => void shutdown('SIGTERM'));
