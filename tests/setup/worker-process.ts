import { spawn, type ChildProcess } from 'node:child_process';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import type { Config } from '../../server/config';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../..');

/**
 * `npm run worker` as a real child process on a test's database and fakes. Node loads tsx itself (no tsx CLI in
 * between, which would run the worker as a grandchild that a SIGKILL of the CLI leaves running), so killing the
 * returned process kills the worker. Resolves once the worker says it is ready.
 */
export function spawnWorkerProcess(config: Config, env: Record<string, string> = {}): Promise<ChildProcess> {
  const child = spawn(process.execPath, ['--import', 'tsx', path.join(root, 'server/worker.ts')], {
    cwd: root,
    env: {
      ...process.env,
      NODE_ENV: 'test',
      LOG_LEVEL: 'silent',
      DATABASE_URL: config.DATABASE_URL,
      PUBLIC_URL: config.PUBLIC_URL,
      SESSION_SECRET: config.SESSION_SECRET,
      RESEND_API_KEY: config.RESEND_API_KEY,
      RESEND_BASE_URL: config.RESEND_BASE_URL ?? '',
      STRIPE_API_BASE_URL: config.STRIPE_API_BASE_URL ?? '',
      STRIPE_SECRET_KEY: config.STRIPE_SECRET_KEY,
      STRIPE_WEBHOOK_SECRET: config.STRIPE_WEBHOOK_SECRET,
      UPLOADS_DIR: config.UPLOADS_DIR,
      ...env,
    },
    stdio: ['ignore', 'ignore', 'pipe', 'ipc'],
  });
  let stderr = '';
  child.stderr!.on('data', (d: Buffer) => {
    stderr += d.toString();
    process.stderr.write(d);
  });
  return new Promise((resolve, reject) => {
    const timer = setTimeout(() => {
      child.kill('SIGKILL');
      reject(new Error(`worker did not start within 90 s: ${stderr.slice(0, 2000)}`));
    }, 90_000);
    child.on('message', (m) => {
      if ((m as { ready?: string }).ready === 'worker') {
        clearTimeout(timer);
        resolve(child);
      }
    });
    child.on('exit', (code) => {
      clearTimeout(timer);
      reject(new Error(`worker exited early (${code}): ${stderr.slice(0, 2000)}`));
    });
  });
}
