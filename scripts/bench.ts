// `npm run bench`: runs every benchmark in tests/bench/*.bench.ts on a throwaway PostgreSQL cluster,
// prints a table and writes bench-results.json.
import { existsSync, mkdtempSync, readFileSync, readdirSync, writeFileSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import pg from 'pg';
import { startCluster, ensureDatabase, removeFolder } from './lib/postgres';
import { migrateDatabase } from '../server/db/migrate';
import { freePort } from '../tests/setup/global-setup';
import type { Benchmark } from '../tests/bench/harness';

// The cluster runs with the durability of `npm start` (fsync, synchronous commit and full-page writes on, the
// PostgreSQL defaults); `BENCH_DURABILITY=off` runs it as the throwaway test clusters do (fsync=off), to compare.
const relaxed = process.env.BENCH_DURABILITY === 'off';
const here = path.dirname(fileURLToPath(import.meta.url));
const benchDir = path.join(here, '..', 'tests', 'bench');
const only = process.argv.slice(2);

const root = mkdtempSync(path.join(os.tmpdir(), 'lightkeel-bench-pg-'));
const cluster = await startCluster({ root, port: await freePort(), throwaway: relaxed });
let durability = '';
const results: Array<{ id: string; ratio: number | null; goal: number; better: string; detail: string; met: boolean }> = [];
try {
  const adminUrl = cluster.url('postgres');
  await ensureDatabase(adminUrl, 'lightkeel_template');
  await migrateDatabase(cluster.url('lightkeel_template'));
  const probe = new pg.Client({ connectionString: adminUrl });
  await probe.connect();
  const settings = await probe.query<{ name: string; setting: string }>(
    `select name, setting from pg_settings where name in ('fsync', 'synchronous_commit', 'full_page_writes') order by name`,
  );
  await probe.end();
  durability =
    settings.rows.map((r) => `${r.name}=${r.setting}`).join(', ') + (relaxed ? ' (relaxed, BENCH_DURABILITY=off)' : ' (as npm start)');
  process.stdout.write(`cluster durability: ${durability}\n`);
  const files = readdirSync(benchDir)
    .filter((f) => f.endsWith('.bench.ts'))
    .sort();
  for (const file of files) {
    const mod = (await import(pathToFileURL(path.join(benchDir, file)).href)) as { benchmarks: Benchmark[] };
    for (const b of mod.benchmarks) {
      if (only.length && !only.some((o) => b.id.startsWith(o))) continue;
      process.stdout.write(`▶ ${b.id} …\n`);
      try {
        const r = await b.run({
          pgAdminUrl: adminUrl,
          pgTemplate: 'lightkeel_template',
          durability,
          log: (m) => process.stdout.write(`  ${m}\n`),
        });
        const met = b.better === 'lower' ? r.ratio <= b.goal : r.ratio >= b.goal;
        results.push({ id: b.id, ratio: Number(r.ratio.toFixed(3)), goal: b.goal, better: b.better, detail: r.detail, met });
      } catch (err) {
        results.push({ id: b.id, ratio: null, goal: b.goal, better: b.better, detail: `failed: ${(err as Error).message}`, met: false });
      }
    }
  }
} finally {
  cluster.stop();
  removeFolder(root);
}
// A run of some benchmarks keeps the other benchmarks' last results.
const previous: typeof results =
  only.length && existsSync('bench-results.json') ? JSON.parse(readFileSync('bench-results.json', 'utf8')) : [];
const merged = [...previous.filter((p) => !results.some((r) => r.id === p.id)), ...results];
writeFileSync('bench-results.json', JSON.stringify(merged, null, 2) + '\n');
console.log('\n' + ['id'.padEnd(22), 'ratio'.padStart(8), 'goal'.padStart(10), 'met'.padStart(5), '  detail'].join(''));
for (const r of results) {
  const goal = `${r.better === 'lower' ? '≤' : '≥'}${r.goal}`;
  console.log(
    [r.id.padEnd(22), String(r.ratio ?? '—').padStart(8), goal.padStart(10), (r.met ? 'yes' : 'no').padStart(5), '  ' + r.detail].join(''),
  );
}
console.log(`\nPostgreSQL: ${durability}`);
console.log('written: bench-results.json');
