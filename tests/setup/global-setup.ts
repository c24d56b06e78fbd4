// Starts one throwaway PostgreSQL cluster for the whole test run (a temp folder, its own port; the dev
// data under .data/ is never touched), migrates a template database once, and hands its URL to the
// workers. Each test file clones the template into a database of its own (tests/setup/test-db.ts).
import { mkdtempSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import net from 'node:net';
import type { TestProject } from 'vitest/node';
import { startCluster, ensureDatabase, removeFolder, type Cluster } from '../../scripts/lib/postgres';
import { migrateDatabase } from '../../server/db/migrate';

declare module 'vitest' {
  export interface ProvidedContext {
    pgAdminUrl: string;
    pgTemplate: string;
  }
}

export async function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const srv = net.createServer();
    srv.once('error', reject);
    srv.listen(0, '127.0.0.1', () => {
      const { port } = srv.address() as net.AddressInfo;
      srv.close(() => resolve(port));
    });
  });
}

let cluster: Cluster | undefined;
let root: string | undefined;

export default async function setup(project: TestProject) {
  let adminUrl = process.env.TEST_PG_ADMIN_URL;
  if (!adminUrl) {
    root = mkdtempSync(path.join(os.tmpdir(), 'lightkeel-test-pg-'));
    cluster = await startCluster({ root, port: await freePort(), throwaway: true });
    adminUrl = cluster.url('postgres');
  }
  const template = 'lightkeel_template';
  const base = adminUrl.replace(/\/[^/]*$/, '');
  await ensureDatabase(adminUrl, template);
  await migrateDatabase(`${base}/${template}`);
  project.provide('pgAdminUrl', adminUrl);
  project.provide('pgTemplate', template);
  return async () => {
    cluster?.stop();
    if (root) removeFolder(root);
  };
}
