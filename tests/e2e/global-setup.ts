// The browser suite runs the whole product as `npm start` does — throwaway PostgreSQL, migrations, demo
// seed, local fakes, the built client served by the API — on free loopback ports.
import pino from 'pino';
import { createJobs } from '../../server/jobs';
import { mkdtempSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { spawnSync } from 'node:child_process';
import type { Server } from 'node:http';
import type { TestProject } from 'vitest/node';
import { startCluster, ensureDatabase, removeFolder } from '../../scripts/lib/postgres';
import { startFakes } from '../../scripts/lib/fakes';
import { migrateDatabase } from '../../server/db/migrate';
import { loadConfig } from '../../server/config';
import { createDb } from '../../server/db/client';
import { createApp, defaultClientDir } from '../../server/app';
import { createMailerFromConfig, createStripeFromConfig } from '../../server/deps';
import { seedDemo } from '../../server/demo/seed';
import { freePort } from '../setup/global-setup';

declare module 'vitest' {
  export interface ProvidedContext {
    baseUrl: string;
    outboxUrl: string;
    paymentsUrl: string;
    /** For tests that declare their own rows (backers of a tier …) beside the demo seed. */
    databaseUrl: string;
  }
}

export default async function setup(project: TestProject) {
  const root = mkdtempSync(path.join(os.tmpdir(), 'lightkeel-e2e-pg-'));
  const cluster = await startCluster({ root, port: await freePort(), throwaway: true });
  await ensureDatabase(cluster.url('postgres'), 'lightkeel');
  await migrateDatabase(cluster.url('lightkeel'));

  const [appPort, idPort, mailPort, payPort] = [await freePort(), await freePort(), await freePort(), await freePort()];
  const config = loadConfig({
    ...process.env,
    // The local fakes and secrets: production would (rightly) refuse them.
    NODE_ENV: 'development',
    // Errors only (no per-request lines): a request answered 503 or 500 says which and why in the suite's output.
    LOG_LEVEL: 'error',
    PORT: String(appPort),
    PUBLIC_URL: `http://127.0.0.1:${appPort}`,
    DATABASE_URL: cluster.url('lightkeel'),
    GOOGLE_OAUTH_BASE_URL: `http://127.0.0.1:${idPort}`,
    RESEND_BASE_URL: `http://127.0.0.1:${mailPort}`,
    STRIPE_API_BASE_URL: `http://127.0.0.1:${payPort}`,
  });
  const dataDir = mkdtempSync(path.join(os.tmpdir(), 'lightkeel-e2e-fakes-'));
  const cwd = process.cwd();
  process.chdir(dataDir); // the fakes keep their state files under ./.data of the throwaway folder
  const fakes = await startFakes(config, () => undefined);
  process.chdir(cwd);

  // The pool as `npm start` sizes it (DATABASE_POOL_MAX): here one process serves the pages and runs every worker and
  // the mail sender; with createDb's default of 10 a request can wait out the 5 s connect timeout under load and
  // answer 503 (the likely cause of one failed run of the large-history test).
  const { db, pool } = createDb(config.DATABASE_URL, { max: config.DATABASE_POOL_MAX });
  await seedDemo({ db, config, log: () => undefined });

  const build = spawnSync(path.join('node_modules', '.bin', 'vite'), ['build', '--logLevel', 'error'], { stdio: 'inherit' });
  if (build.status !== 0) throw new Error('vite build failed');

  // One process plays web and worker here: the jobs (and the mail sender) run beside the app.
  const jobs = createJobs({ pool, db, config, logger: pino({ level: 'silent' }), worker: true });
  await jobs.start();
  await jobs.work();
  const app = createApp({
    db,
    pool,
    config,
    jobs,
    mailer: createMailerFromConfig(config),
    stripe: createStripeFromConfig(config),
    clientDir: defaultClientDir,
  });
  const server: Server = await new Promise((resolve) => {
    const s = app.listen(appPort, '127.0.0.1', () => resolve(s));
  });
  project.provide('baseUrl', config.PUBLIC_URL);
  project.provide('outboxUrl', `http://127.0.0.1:${mailPort}`);
  project.provide('paymentsUrl', `http://127.0.0.1:${payPort}`);
  project.provide('databaseUrl', config.DATABASE_URL);

  return async () => {
    await new Promise((r) => server.close(r));
    await jobs.stop();
    await pool.end();
    await fakes.close();
    cluster.stop();
    removeFolder(root);
    removeFolder(dataDir);
  };
}
