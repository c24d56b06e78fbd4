// `npm start` (and `npm run dev` with --dev): PostgreSQL on loopback, migrations, demo seed, the local
// fakes of the hosted services, the built client served by the API on :3000, and one background worker
// process (server/worker.ts; `--workers N` for more, `--workers 0` for none). Ctrl-C stops all of it.
// The console stays quiet: warnings and errors only, unless LOG_LEVEL is set or --verbose is given (per-request
// lines then). The banner is printed once the web app answers and every worker is polling.
import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { startCluster, ensureDatabase } from './lib/postgres';
import { migrateDatabase } from '../server/db/migrate';
import { loadConfig } from '../server/config';
import { createDb } from '../server/db/client';
import { seedDemo, isDatabaseEmpty } from '../server/demo/seed';
import { demoAccounts, DEMO_PASSWORD } from '../server/demo/accounts';
import { startFakes } from './lib/fakes';

const repo = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
const dev = process.argv.includes('--dev');
const verbose = process.argv.includes('--verbose');
const workersArg = process.argv.indexOf('--workers');
const workerCount = workersArg >= 0 ? Math.max(0, Number(process.argv[workersArg + 1]) || 0) : 1;
const pgPort = Number(process.env.PG_PORT ?? 54329);
const say = (m: string) => process.stdout.write(`[lightkeel] ${m}\n`);

const cleanups: Array<() => void | Promise<void>> = [];
const children: ChildProcess[] = [];
let stopping = false;
/** How long a stop waits for the app's processes to exit before it stops PostgreSQL anyway. */
const STOP_WAIT_MS = 20_000;
async function stopAll(code = 0) {
  if (stopping) return;
  stopping = true;
  say('stopping …');
  // The web app and the workers finish their work and close their connections before PostgreSQL stops under them.
  const exited = children
    .filter((c) => c.exitCode === null && c.signalCode === null)
    .map((c) => new Promise<void>((resolve) => c.once('exit', () => resolve())));
  for (const c of children) {
    try {
      if (c.pid) process.kill(-c.pid, 'SIGTERM');
    } catch {
      /* already gone */
    }
  }
  await Promise.race([Promise.all(exited), new Promise((resolve) => setTimeout(resolve, STOP_WAIT_MS))]);
  for (const fn of cleanups.reverse()) await fn();
  process.exit(code);
}
process.on('SIGINT', () => void stopAll(0));
process.on('SIGTERM', () => void stopAll(0));

function run(cmd: string, args: string[], env: NodeJS.ProcessEnv = process.env) {
  const child = spawn(cmd, args, { cwd: repo, env, stdio: ['inherit', 'inherit', 'inherit', 'ipc'], detached: true });
  children.push(child);
  child.on('exit', (code) => {
    if (!stopping) {
      say(`${path.basename(cmd)} ${args[0] ?? ''} exited (${code}); stopping the rest`);
      void stopAll(code ?? 1);
    }
  });
  return child;
}

async function waitForHealth(url: string, timeoutMs = 120_000) {
  const until = Date.now() + timeoutMs;
  while (Date.now() < until) {
    if (stopping) return;
    try {
      const res = await fetch(url);
      if (res.ok) return;
    } catch {
      /* not listening yet */
    }
    await new Promise((r) => setTimeout(r, 250));
  }
  throw new Error(`the web app did not answer ${url} within ${timeoutMs / 1000} s`);
}

function waitForReady(child: ChildProcess, timeoutMs = 120_000) {
  return new Promise<void>((resolve, reject) => {
    const timer = setTimeout(() => reject(new Error('a worker did not report ready in time')), timeoutMs);
    child.on('message', (m: { ready?: string }) => {
      if (m?.ready) {
        clearTimeout(timer);
        resolve();
      }
    });
  });
}

try {
  const cluster = await startCluster({ root: path.join(repo, '.data', 'pg'), port: pgPort });
  cleanups.push(() => cluster.stop());
  const databaseUrl = process.env.DATABASE_URL ?? cluster.url('lightkeel');
  if (await ensureDatabase(cluster.url('postgres'), 'lightkeel')) say('created database lightkeel');
  await migrateDatabase(databaseUrl);
  say('migrations applied');

  const env: NodeJS.ProcessEnv = {
    ...process.env,
    DATABASE_URL: databaseUrl,
    LOG_LEVEL: process.env.LOG_LEVEL ?? (verbose ? 'info' : 'warn'),
  };
  const config = loadConfig(env);

  const fakes = await startFakes(config, say);
  cleanups.push(() => fakes.close());

  const { db, pool } = createDb(databaseUrl, { max: 2 });
  if (!(await isDatabaseEmpty(db))) say('reusing the data in .data/pg (adding only demo data it lacks)');
  await seedDemo({ db, config, log: say });
  await pool.end();

  const bin = (name: string) => path.join(repo, 'node_modules', '.bin', name);
  const workers: ChildProcess[] = [];
  if (dev) {
    run(bin('tsx'), ['watch', '--clear-screen=false', 'server/index.ts'], env);
    for (let i = 0; i < workerCount; i++) workers.push(run(bin('tsx'), ['server/worker.ts'], env));
    run(bin('vite'), ['--strictPort', '--logLevel', verbose ? 'info' : 'warn'], env);
  } else {
    say('building the client (vite build) …');
    const build = spawnSync(bin('vite'), ['build', '--logLevel', 'warn'], { cwd: repo, stdio: 'inherit', env });
    if (build.status !== 0) throw new Error('client build failed');
    // Not NODE_ENV=production: that refuses the local secrets and the loopback fakes this script runs.
    const nodeEnv = env.NODE_ENV ?? 'development';
    run(bin('tsx'), ['server/index.ts'], { ...env, NODE_ENV: nodeEnv });
    for (let i = 0; i < workerCount; i++) workers.push(run(bin('tsx'), ['server/worker.ts'], { ...env, NODE_ENV: nodeEnv }));
  }
  say(`starting the web app and ${workerCount} worker${workerCount === 1 ? '' : 's'} …`);
  await Promise.all([waitForHealth(`${config.PUBLIC_URL}/api/health`), ...workers.map((w) => waitForReady(w))]);

  const appUrl = dev ? `http://127.0.0.1:${process.env.VITE_PORT ?? 5173}` : config.PUBLIC_URL;
  const lines = [
    '',
    `  Lightkeel           ${appUrl}${dev ? `   (API on ${config.PUBLIC_URL})` : ''}`,
    `  health              ${config.PUBLIC_URL}/api/health`,
    ...fakes.urls.map(([name, url]) => `  ${name.padEnd(20)}${url}`),
    `  PostgreSQL          127.0.0.1:${pgPort} (data in .data/pg)`,
    `  workers             ${workerCount} (npm run worker starts more)`,
    `  logs                ${env.LOG_LEVEL}${verbose || process.env.LOG_LEVEL ? '' : ' (--verbose or LOG_LEVEL=info shows each request)'}`,
    '',
    `  Demo accounts (password for all: ${DEMO_PASSWORD})`,
    ...demoAccounts.map((a) => `    ${a.email.padEnd(30)} ${a.roles.length ? a.roles.join(', ') : 'backer'}`),
    '',
    '  Ctrl-C stops everything.',
    '',
  ];
  process.stdout.write(lines.join('\n') + '\n');
} catch (err) {
  say(`start failed: ${(err as Error).message}`);
  await stopAll(1);
}
