// `npm start` (and `npm run dev` with --dev): PostgreSQL on loopback, migrations, demo seed, the local
// fakes of the hosted services, the built client served by the API on :3000. Ctrl-C stops all of it.
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
const pgPort = Number(process.env.PG_PORT ?? 54329);
const say = (m: string) => process.stdout.write(`[lightkeel] ${m}\n`);

const cleanups: Array<() => void | Promise<void>> = [];
const children: ChildProcess[] = [];
let stopping = false;
async function stopAll(code = 0) {
  if (stopping) return;
  stopping = true;
  say('stopping …');
  for (const c of children) {
    try {
      if (c.pid) process.kill(-c.pid, 'SIGTERM');
    } catch {
      /* already gone */
    }
  }
  for (const fn of cleanups.reverse()) await fn();
  process.exit(code);
}
process.on('SIGINT', () => void stopAll(0));
process.on('SIGTERM', () => void stopAll(0));

function run(cmd: string, args: string[], env: NodeJS.ProcessEnv = process.env) {
  const child = spawn(cmd, args, { cwd: repo, env, stdio: 'inherit', detached: true });
  children.push(child);
  child.on('exit', (code) => {
    if (!stopping) {
      say(`${path.basename(cmd)} ${args[0] ?? ''} exited (${code}); stopping the rest`);
      void stopAll(code ?? 1);
    }
  });
  return child;
}

try {
  const cluster = await startCluster({ root: path.join(repo, '.data', 'pg'), port: pgPort });
  cleanups.push(() => cluster.stop());
  const databaseUrl = process.env.DATABASE_URL ?? cluster.url('lightkeel');
  if (await ensureDatabase(cluster.url('postgres'), 'lightkeel')) say('created database lightkeel');
  await migrateDatabase(databaseUrl);
  say('migrations applied');

  const env: NodeJS.ProcessEnv = { ...process.env, DATABASE_URL: databaseUrl };
  const config = loadConfig(env);

  const fakes = await startFakes(config, say);
  cleanups.push(() => fakes.close());

  const { db, pool } = createDb(databaseUrl, { max: 2 });
  if (!(await isDatabaseEmpty(db))) say('reusing the data in .data/pg (adding only demo data it lacks)');
  await seedDemo({ db, config, log: say });
  await pool.end();

  const bin = (name: string) => path.join(repo, 'node_modules', '.bin', name);
  if (dev) {
    run(bin('tsx'), ['watch', '--clear-screen=false', 'server/index.ts'], env);
    run(bin('vite'), ['--strictPort'], env);
  } else {
    say('building the client (vite build) …');
    const build = spawnSync(bin('vite'), ['build', '--logLevel', 'warn'], { cwd: repo, stdio: 'inherit', env });
    if (build.status !== 0) throw new Error('client build failed');
    // Not NODE_ENV=production: that refuses the local secrets and the loopback fakes this script runs.
    run(bin('tsx'), ['server/index.ts'], { ...env, NODE_ENV: env.NODE_ENV ?? 'development' });
  }

  const appUrl = dev ? `http://127.0.0.1:${process.env.VITE_PORT ?? 5173}` : config.PUBLIC_URL;
  const lines = [
    '',
    `  Lightkeel           ${appUrl}${dev ? `   (API on ${config.PUBLIC_URL})` : ''}`,
    `  health              ${config.PUBLIC_URL}/api/health`,
    ...fakes.urls.map(([name, url]) => `  ${name.padEnd(20)}${url}`),
    `  PostgreSQL          127.0.0.1:${pgPort} (data in .data/pg)`,
    '',
    `  Demo accounts (password for all: ${DEMO_PASSWORD})`,
    ...demoAccounts.map((a) => `    ${a.email.padEnd(30)} ${a.roles.length ? a.roles.join(', ') : 'backer'}`),
    '',
    '  Ctrl-C stops everything.',
    '',
  ];
  setTimeout(() => process.stdout.write(lines.join('\n') + '\n'), dev ? 1500 : 800);
} catch (err) {
  say(`start failed: ${(err as Error).message}`);
  await stopAll(1);
}
