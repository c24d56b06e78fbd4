// The benchmark contract: every tests/bench/*.bench.ts exports `benchmarks`, each measuring our path
// against a bare baseline in the same run and returning the ratio.
import { randomBytes } from 'node:crypto';
import pg from 'pg';

export type BenchContext = {
  /** postgres://… of a throwaway cluster's admin database; create your own databases in it. */
  pgAdminUrl: string;
  /** A migrated template database name to clone (`create database x template <name>`). */
  pgTemplate: string;
  log: (message: string) => void;
  /** The cluster's durability settings as measured (e.g. "fsync=on, synchronous_commit=on, full_page_writes=on"). */
  durability: string;
};

export type BenchResult = { ratio: number; detail: string };

export type Benchmark = {
  id: string;
  goal: number;
  better: 'lower' | 'higher';
  run: (ctx: BenchContext) => Promise<BenchResult>;
};

export function median(values: number[]): number {
  const s = [...values].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m]! : (s[m - 1]! + s[m]!) / 2;
}

/** Times fn `repeats` times (after one warm-up) and returns the median in milliseconds. */
export async function timeMedianMs(fn: () => unknown | Promise<unknown>, repeats = 5): Promise<number> {
  await fn();
  const times: number[] = [];
  for (let i = 0; i < repeats; i++) {
    const t0 = performance.now();
    await fn();
    times.push(performance.now() - t0);
  }
  return median(times);
}

/** A throwaway database copied from the bench cluster's migrated template: its name (to drop it) and URL. */
export async function createBenchDatabase(
  ctx: Pick<BenchContext, 'pgAdminUrl' | 'pgTemplate'>,
  prefix: string,
): Promise<{ name: string; url: string }> {
  const name = `${prefix}_${randomBytes(4).toString('hex')}`;
  const admin = new pg.Client({ connectionString: ctx.pgAdminUrl });
  await admin.connect();
  await admin.query(`create database "${name}" template "${ctx.pgTemplate}"`);
  await admin.end();
  return { name, url: ctx.pgAdminUrl.replace(/\/[^/]*$/, `/${name}`) };
}
