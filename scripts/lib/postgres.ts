// Starts and stops a PostgreSQL cluster on loopback, as root through the `postgres` system user.
// Used by `npm start` (a kept cluster under .data/) and by the tests (a throwaway one in a temp folder).
import { execFileSync, spawnSync } from 'node:child_process';
import { existsSync, mkdirSync, readdirSync, writeFileSync, chmodSync, rmSync } from 'node:fs';
import path from 'node:path';
import pg from 'pg';

export type Cluster = {
  root: string;
  port: number;
  url: (database: string) => string;
  stop: () => void;
};

function log(message: string) {
  process.stdout.write(`[postgres] ${message}\n`);
}

export function findPgBin(): string | undefined {
  const base = '/usr/lib/postgresql';
  if (!existsSync(base)) return undefined;
  const versions = readdirSync(base)
    .filter((v) => existsSync(path.join(base, v, 'bin', 'postgres')))
    .sort((a, b) => Number(b) - Number(a));
  return versions[0] ? path.join(base, versions[0], 'bin') : undefined;
}

export function ensurePostgresInstalled(): string {
  let bin = findPgBin();
  if (bin) return bin;
  log("no PostgreSQL server found: installing Debian's postgresql package (apt-get) — this takes a minute");
  const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' };
  execFileSync('apt-get', ['update', '-qq'], { stdio: 'inherit', env });
  execFileSync('apt-get', ['install', '-y', '-qq', 'postgresql'], { stdio: 'inherit', env });
  // The Debian package may start its own cluster on 5432; ours runs apart from it.
  spawnSync('service', ['postgresql', 'stop'], { stdio: 'ignore' });
  bin = findPgBin();
  if (!bin) throw new Error('PostgreSQL was installed but no server binary was found under /usr/lib/postgresql');
  return bin;
}

function ensureSystemUser() {
  const r = spawnSync('id', ['-u', 'postgres']);
  if (r.status !== 0) {
    execFileSync('useradd', ['--system', '--home-dir', '/nonexistent', '--shell', '/usr/sbin/nologin', 'postgres']);
  }
}

function asPostgres(cmd: string, args: string[], opts: { quiet?: boolean } = {}) {
  const isRoot = process.getuid?.() === 0;
  const [file, argv] = isRoot ? ['runuser', ['-u', 'postgres', '--', cmd, ...args]] : [cmd, args];
  return execFileSync(file, argv, { stdio: opts.quiet ? 'pipe' : 'inherit' });
}

export async function startCluster(opts: { root: string; port: number; throwaway?: boolean }): Promise<Cluster> {
  const bin = ensurePostgresInstalled();
  const isRoot = process.getuid?.() === 0;
  if (isRoot) ensureSystemUser();
  const root = path.resolve(opts.root);
  const data = path.join(root, 'data');
  const sock = path.join(root, 'sock');
  mkdirSync(data, { recursive: true });
  mkdirSync(sock, { recursive: true });
  if (isRoot) execFileSync('chown', ['-R', 'postgres:', root]);
  chmodSync(data, 0o700);
  if (!existsSync(path.join(data, 'PG_VERSION'))) {
    log(`creating a cluster in ${data}`);
    asPostgres(path.join(bin, 'initdb'), ['-D', data, '-U', 'postgres', '--auth=trust', '--encoding=UTF8', '--locale=C.UTF-8'], {
      quiet: true,
    });
    if (opts.throwaway) {
      writeFileSync(path.join(data, 'postgresql.auto.conf'), 'fsync = off\nsynchronous_commit = off\nfull_page_writes = off\n');
      if (isRoot) execFileSync('chown', ['postgres:', path.join(data, 'postgresql.auto.conf')]);
    }
  }
  const logFile = path.join(root, 'postgres.log');
  const pidFile = path.join(data, 'postmaster.pid');
  if (existsSync(pidFile)) {
    // A stale pid file from a killed run: pg_ctl status tells whether it is alive.
    const status = spawnSync(
      isRoot ? 'runuser' : path.join(bin, 'pg_ctl'),
      isRoot ? ['-u', 'postgres', '--', path.join(bin, 'pg_ctl'), '-D', data, 'status'] : ['-D', data, 'status'],
    );
    if (status.status === 0) {
      log(`cluster already running in ${data}`);
      return makeCluster(root, opts.port, bin, data, false);
    }
  }
  asPostgres(
    path.join(bin, 'pg_ctl'),
    [
      '-D',
      data,
      '-l',
      logFile,
      '-w',
      '-t',
      '60',
      '-o',
      `-c listen_addresses=127.0.0.1 -p ${opts.port} -k ${sock} -c max_connections=300`,
      'start',
    ],
    { quiet: true },
  );
  log(`listening on 127.0.0.1:${opts.port}`);
  return makeCluster(root, opts.port, bin, data, true);
}

function makeCluster(root: string, port: number, bin: string, data: string, owned: boolean): Cluster {
  let stopped = false;
  return {
    root,
    port,
    url: (database) => `postgres://postgres@127.0.0.1:${port}/${database}`,
    stop: () => {
      if (stopped || !owned) return;
      stopped = true;
      try {
        asPostgres(path.join(bin, 'pg_ctl'), ['-D', data, '-m', 'fast', '-w', 'stop'], { quiet: true });
        log('stopped');
      } catch (err) {
        log(`stop failed: ${(err as Error).message}`);
      }
    },
  };
}

export async function ensureDatabase(adminUrl: string, name: string, template?: string) {
  const client = new pg.Client({ connectionString: adminUrl });
  await client.connect();
  try {
    const found = await client.query('select 1 from pg_database where datname = $1', [name]);
    if (found.rowCount === 0) {
      await client.query(`create database "${name}"${template ? ` template "${template}"` : ''}`);
      return true;
    }
    return false;
  } finally {
    await client.end();
  }
}

export async function dropDatabase(adminUrl: string, name: string) {
  const client = new pg.Client({ connectionString: adminUrl });
  await client.connect();
  try {
    await client.query(`drop database if exists "${name}" with (force)`);
  } finally {
    await client.end();
  }
}

export function removeFolder(folder: string) {
  rmSync(folder, { recursive: true, force: true });
}
