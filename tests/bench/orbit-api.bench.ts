// Orbit desk benchmarks: our upload → preview → import path and the trend endpoint, each against a bare
// baseline on the same rows in the same run.
import { pipeline } from 'node:stream/promises';
import { Readable } from 'node:stream';
import pg from 'pg';
import type { ChildProcess } from 'node:child_process';
import { spawnWorkerProcess } from '../setup/worker-process';
import pino from 'pino';
import request from 'supertest';
import { from as copyFrom } from 'pg-copy-streams';
import { createApp } from '../../server/app';
import { loadConfig } from '../../server/config';
import { createDb } from '../../server/db/client';
import { createJobs, type Jobs, type QueueDefinition } from '../../server/jobs';
import { elementSetIngestFailedQueue, elementSetIngestQueue } from '../../server/jobs/element-set-ingest';
import { createMailerFromConfig, createStripeFromConfig } from '../../server/deps';
import { DEMO_PASSWORD, seedDemoAccounts } from '../../server/demo/accounts';
import { writeTle, type TleWriteInput } from '../../shared/orbit/tle-write';
import { deriveElementSet } from '../../shared/orbit/derived';
import { bareParseTle } from './orbit.bench';
import { createBenchDatabase, median, type BenchContext, type Benchmark } from './harness';

const DAY_MS = 86_400_000;

function sets(count: number, catalog: number): TleWriteInput[] {
  const out: TleWriteInput[] = [];
  for (let i = 0; i < count; i++) {
    const day = i * 0.01;
    out.push({
      catalogNumber: String(catalog).padStart(5, '0'),
      catalogNumberInt: catalog,
      classification: 'U',
      internationalDesignator: '25951C',
      epochMs: Date.UTC(2020, 0, 1) + day * DAY_MS,
      meanMotionRevPerDay: 14.3266 - day * 2e-6 + 1e-6 * Math.sin(i),
      meanMotionDotRevPerDay2: 2.5e-6,
      meanMotionDdotRevPerDay3: 0,
      bstar: 2.1e-3,
      inclinationDeg: 98.52,
      raanDeg: (40 + day) % 360,
      eccentricity: 0.0002 + 1e-5 * Math.sin(i / 50),
      argPerigeeDeg: (90 + i) % 360,
      meanAnomalyDeg: (270 + 7 * i) % 360,
      elementSetNo: (i % 999) + 1,
      revAtEpoch: (12000 + Math.round(day * 14.3)) % 100000,
    });
  }
  return out;
}

async function freshDatabase(ctx: BenchContext) {
  const { name, url } = await createBenchDatabase(ctx, 'bench_orbit');
  const { db, pool } = createDb(url);
  const jobs: Jobs[] = [];
  const workers: ChildProcess[] = [];
  return {
    db,
    pool,
    url,
    jobs,
    workers,
    drop: async () => {
      for (const w of workers) w.kill('SIGKILL');
      for (const j of jobs) await j.stop();
      await pool.end();
      const c = new pg.Client({ connectionString: ctx.pgAdminUrl });
      await c.connect();
      await c.query(`drop database if exists "${name}" with (force)`);
      await c.end();
    },
  };
}

async function appOn(d: Awaited<ReturnType<typeof freshDatabase>>) {
  const config = loadConfig({
    NODE_ENV: 'test',
    LOG_LEVEL: 'silent',
    DATABASE_URL: d.url,
    SESSION_SECRET: 'bench-session-secret-0123456789',
    UPLOAD_LIMIT_BYTES: String(64 * 1024 * 1024),
    SIGN_IN_LIMIT_PER_IP: '1000',
  });
  // Uploads are previewed and imported by a worker in a process of its own, as npm start runs it (server/worker.ts);
  // the web process only enqueues.
  const jobs = createJobs({
    pool: d.pool,
    db: d.db,
    config,
    logger: pino({ level: 'silent' }),
    queues: [elementSetIngestQueue as QueueDefinition, elementSetIngestFailedQueue as QueueDefinition],
  });
  await jobs.start();
  d.jobs.push(jobs);
  d.workers.push(await spawnWorkerProcess(config, { UPLOAD_LIMIT_BYTES: config.UPLOAD_LIMIT_BYTES.toString() }));
  const app = createApp({
    db: d.db,
    pool: d.pool,
    config,
    jobs,
    mailer: createMailerFromConfig(config),
    stripe: createStripeFromConfig(config),
  });
  await seedDemoAccounts(d.db);
  const agent = request.agent(app);
  let csrf = (await agent.get('/api/auth/csrf')).body.csrfToken as string;
  await agent
    .post('/api/auth/sign-in')
    .set('x-csrf-token', csrf)
    .send({ email: 'engineer@saltmarsh.example', password: DEMO_PASSWORD })
    .expect(200);
  csrf = (await agent.get('/api/auth/csrf')).body.csrfToken as string;
  return { agent, csrf };
}

async function createCraft(agent: request.Agent, csrf: string, catalog: number) {
  const res = await agent
    .post('/api/orbit/spacecraft')
    .set('x-csrf-token', csrf)
    .send({
      name: `Bench ${catalog}`,
      slug: `bench-${catalog}`,
      catalogNumber: String(catalog),
      massKg: 4.8,
      sailAreaM2: 24,
      sailReflectivity: 0.9,
      dragCoefficient: 2.2,
      dragAreaEdgeOnM2: 0.12,
    })
    .expect(201);
  return res.body.spacecraft.id as string;
}

/** Follows the upload as the orbit desk does: each status request holds the version seen and is answered on a change. */
async function settle(agent: request.Agent, jobId: string, seen: string) {
  let version = seen;
  for (let i = 0; i < 20_000; i++) {
    const job = (await agent.get(`/api/orbit/uploads/${jobId}`).query({ after: version }).expect(200)).body.upload;
    if (job.status !== 'parsing' && job.status !== 'importing') return job;
    version = job.version;
  }
  throw new Error('upload did not settle');
}

function fileOf(list: TleWriteInput[]) {
  const lines: string[] = [];
  for (const s of list) {
    const { line1, line2 } = writeTle(s);
    lines.push(line1, line2);
  }
  return lines.join('\n') + '\n';
}

/**
 * The bare baseline: the bare fixed-column parse of orbit.parse (split, `slice` + `Number`, no validation) and the same
 * derive as ours, then one COPY of the same columns into element_sets. With `skipStored` the rows go through a scratch
 * table and `insert … on conflict do nothing` on the unique key, the least SQL that stores only the sets not already
 * there.
 */
async function bareParseAndCopy(pool: pg.Pool, text: string, spacecraftId: string, fileId: string, skipStored = false) {
  const rows: string[] = [];
  const sets = bareParseTle(text);
  for (let k = 0; k < sets.length; k++) {
    const s = sets[k]!;
    const d = deriveElementSet(s);
    rows.push(
      [
        spacecraftId,
        fileId,
        2 * k + 1,
        s.catalogNumberInt,
        new Date(s.epochMs).toISOString(),
        s.epochMs,
        s.elementSetNo,
        s.classification,
        s.internationalDesignator,
        s.meanMotionRevPerDay,
        s.meanMotionDotRevPerDay2,
        s.meanMotionDdotRevPerDay3,
        s.bstar,
        s.inclinationDeg,
        s.raanDeg,
        s.eccentricity,
        s.argPerigeeDeg,
        s.meanAnomalyDeg,
        s.revAtEpoch,
        s.line1,
        s.line2,
        d.semiMajorAxisKm,
        d.apogeeAltitudeKm,
        d.perigeeAltitudeKm,
        d.meanAltitudeKm,
        d.periodMin,
        d.specificEnergyJPerKg,
      ].join('\t'),
    );
  }
  const client = await pool.connect();
  try {
    await client.query('begin');
    if (skipStored) await client.query('create temp table bare_sets (like element_sets including defaults) on commit drop');
    const stream = client.query(
      copyFrom(`copy ${skipStored ? 'bare_sets' : 'element_sets'} (spacecraft_id, file_id, source_line, catalog_number_int, epoch, epoch_ms, element_set_no, classification,
      international_designator, mean_motion_rev_per_day, mean_motion_dot_rev_per_day2, mean_motion_ddot_rev_per_day3, bstar, inclination_deg, raan_deg,
      eccentricity, arg_perigee_deg, mean_anomaly_deg, rev_at_epoch, line1, line2, semi_major_axis_km, apogee_altitude_km, perigee_altitude_km,
      mean_altitude_km, period_min, specific_energy_j_per_kg) from stdin`),
    );
    await pipeline(Readable.from([rows.join('\n') + '\n']), stream);
    if (skipStored)
      await client.query(
        'insert into element_sets select * from bare_sets on conflict (spacecraft_id, catalog_number_int, epoch, element_set_no) do nothing',
      );
    await client.query('commit');
  } finally {
    client.release();
  }
  return rows.length;
}

/** Our path as a client sees it: upload, wait for the preview, ask for the import, wait until it is done. */
async function importThroughApi(agent: request.Agent, csrf: string, craftId: string, text: string, expectNew: number) {
  const t0 = performance.now();
  const started = await agent
    .post(`/api/orbit/spacecraft/${craftId}/uploads`)
    .set('x-csrf-token', csrf)
    .attach('file', Buffer.from(text), 'bench.tle')
    .expect(202);
  const preview = await settle(agent, started.body.upload.id, started.body.upload.version);
  if (preview.counts.new !== expectNew) throw new Error(`preview found ${preview.counts.new} new sets, expected ${expectNew}`);
  const importing = await agent.post(`/api/orbit/uploads/${preview.id}/import`).set('x-csrf-token', csrf).send({}).expect(202);
  const done = await settle(agent, preview.id, importing.body.upload.version);
  const ms = performance.now() - t0;
  if (done.importedCount !== expectNew) throw new Error(`imported ${done.importedCount}, expected ${expectNew}`);
  return ms;
}

async function fileRow(pool: pg.Pool, craftId: string) {
  const { rows } = await pool.query(
    `insert into element_set_files (spacecraft_id, content_sha256, filename, format, byte_size, content, record_count, imported_count, duplicate_count, invalid_count)
     values ($1, 'bench-' || gen_random_uuid(), 'bench.tle', 'tle', 0, '', 0, 0, 0, 0) returning id`,
    [craftId],
  );
  return rows[0].id as string;
}

async function countSets(pool: pg.Pool, craftId: string) {
  const { rows } = await pool.query('select count(*)::int as n from element_sets where spacecraft_id = $1', [craftId]);
  return rows[0].n as number;
}

const ingest: Benchmark = {
  id: 'ingest.api',
  goal: 1.0,
  better: 'lower',
  async run(ctx) {
    const N = 100_000;
    // An even number of repetitions: each side goes first in half of them.
    const REPS = Number(process.env.BENCH_REPS ?? 4);
    const WARM_UP = 20_000;
    const fresh = { ours: [] as number[], bare: [] as number[] },
      overlap = { ours: [] as number[], bare: [] as number[] };
    for (let rep = 0; rep < REPS; rep++) {
      const catalog = 90000 + rep * 10;
      const d = await freshDatabase(ctx);
      try {
        const { agent, csrf } = await appOn(d);
        // Four spacecraft in one database (same indexes, same table): fresh ours / bare, overlap ours / bare.
        // One after another: the first craft of a database becomes the mission's own, which concurrent creates race for.
        const crafts: string[] = [];
        for (const k of [0, 1, 2, 3, 4, 5]) crafts.push(await createCraft(agent, csrf, catalog + k));
        const texts = [0, 1, 2, 3].map((k) => fileOf(sets(N, catalog + k)));
        // The overlap files: the first half of their sets is stored beforehand (untimed, the same way on both sides).
        for (const k of [2, 3]) {
          const half = texts[k]!.split('\n').slice(0, N).join('\n') + '\n';
          await bareParseAndCopy(d.pool, half, crafts[k]!, await fileRow(d.pool, crafts[k]!));
          if ((await countSets(d.pool, crafts[k]!)) !== N / 2) throw new Error('overlap set-up stored the wrong count');
        }
        await d.pool.query('vacuum analyze element_sets');
        // Ours and bare alternate which goes first from one repetition to the next.
        const oursFirst = rep % 2 === 0;
        const runFresh = async (side: 'ours' | 'bare') => {
          if (side === 'ours') fresh.ours.push(await importThroughApi(agent, csrf, crafts[0]!, texts[0]!, N));
          else {
            const fileId = await fileRow(d.pool, crafts[1]!);
            const t1 = performance.now();
            const copied = await bareParseAndCopy(d.pool, texts[1]!, crafts[1]!, fileId);
            fresh.bare.push(performance.now() - t1);
            if (copied !== N || (await countSets(d.pool, crafts[1]!)) !== N) throw new Error('bare fresh copy lost rows');
          }
        };
        const runOverlap = async (side: 'ours' | 'bare') => {
          if (side === 'ours') overlap.ours.push(await importThroughApi(agent, csrf, crafts[2]!, texts[2]!, N / 2));
          else {
            const fileId = await fileRow(d.pool, crafts[3]!);
            const t1 = performance.now();
            await bareParseAndCopy(d.pool, texts[3]!, crafts[3]!, fileId, true);
            overlap.bare.push(performance.now() - t1);
            if ((await countSets(d.pool, crafts[3]!)) !== N) throw new Error('bare overlap insert lost rows');
          }
        };
        const order: Array<'ours' | 'bare'> = oursFirst ? ['ours', 'bare'] : ['bare', 'ours'];
        // Untimed warm-up, both sides, in this repetition's order: the app and its worker start afresh in each
        // repetition, while the bare side runs in this long-lived process; a server in use has run its code before.
        const warm = [4, 5].map((k) => fileOf(sets(WARM_UP, catalog + k)));
        for (const side of order) {
          if (side === 'ours') await importThroughApi(agent, csrf, crafts[4]!, warm[0]!, WARM_UP);
          else await bareParseAndCopy(d.pool, warm[1]!, crafts[5]!, await fileRow(d.pool, crafts[5]!));
        }
        for (const side of order) await runFresh(side);
        for (const side of order) await runOverlap(side);
        ctx.log(
          `rep ${rep + 1} (${order.join(' then ')}): fresh ${fresh.ours[rep]!.toFixed(0)} vs ${fresh.bare[rep]!.toFixed(0)} ms; half stored ${overlap.ours[rep]!.toFixed(0)} vs ${overlap.bare[rep]!.toFixed(0)} ms`,
        );
      } finally {
        await d.drop();
      }
    }
    const ratioOf = (x: { ours: number[]; bare: number[] }) => median(x.ours.map((o, k) => o / x.bare[k]!));
    const fr = ratioOf(fresh),
      ov = ratioOf(overlap);
    if (ov > 1.5) throw new Error(`with half the sets already stored: ${ov.toFixed(2)}× (goal ≤ 1.5×)`);
    return {
      ratio: fr,
      detail:
        `${N.toLocaleString('en-GB')} sets, client's view from upload to import done (upload→preview→import) vs bare slice+Number parse + the same derive + one COPY: ` +
        `fresh file ${median(fresh.ours).toFixed(0)} vs ${median(fresh.bare).toFixed(0)} ms; ` +
        `half already stored ${median(overlap.ours).toFixed(0)} vs ${median(overlap.bare).toFixed(0)} ms (bare: COPY to a scratch table + insert on conflict do nothing) = ${ov.toFixed(2)}× (goal ≤ 1.5×); ` +
        `median of ${REPS} per-rep ratios, ours first in odd reps, bare first in even ones, each rep after an untimed ${WARM_UP.toLocaleString('en-GB')}-set warm-up of both sides; ${ctx.durability}`,
    };
  },
};

type SeriesReply = {
  epochMs: number[];
  apogeeKm: number[];
  perigeeKm: number[];
  meanAltitudeKm: number[];
  semiMajorAxisKm: number[];
  energyJPerKg: number[];
};

/**
 * The bare side of trend.api: one SELECT of the same rows in the same order, then the same reduction the endpoint
 * sends (min/max per pixel column over the whole history, outliers kept apart), written as the least code that does
 * it, sent as JSON. It does not fit the rate lines: the endpoint does that on top (the rates of a window it has not
 * seen, every round), so the ratio counts that work against ours.
 */
function bareTrendHandler(pool: pg.Pool, craftId: string, columns: number) {
  return async (_req: unknown, res: { json: (body: unknown) => void }) => {
    const { rows } = await pool.query(
      'select epoch_ms, apogee_altitude_km, perigee_altitude_km, mean_altitude_km, semi_major_axis_km, specific_energy_j_per_kg, outlier from element_sets where spacecraft_id = $1 order by epoch_ms, element_set_no',
      [craftId],
    );
    const keys = [
      'apogee_altitude_km',
      'perigee_altitude_km',
      'mean_altitude_km',
      'semi_major_axis_km',
      'specific_energy_j_per_kg',
    ] as const;
    const out: SeriesReply = { epochMs: [], apogeeKm: [], perigeeKm: [], meanAltitudeKm: [], semiMajorAxisKm: [], energyJPerKg: [] };
    const outliers: SeriesReply = { epochMs: [], apogeeKm: [], perigeeKm: [], meanAltitudeKm: [], semiMajorAxisKm: [], energyJPerKg: [] };
    const lists = (o: SeriesReply) => [o.apogeeKm, o.perigeeKm, o.meanAltitudeKm, o.semiMajorAxisKm, o.energyJPerKg];
    const good = rows.filter((r) => {
      if (!r.outlier) return true;
      outliers.epochMs.push(r.epoch_ms);
      lists(outliers).forEach((l, j) => l.push(r[keys[j]!]));
      return false;
    });
    const fromMs = rows.length ? rows[0].epoch_ms : 0,
      toMs = rows.length ? rows[rows.length - 1].epoch_ms : 0;
    const width = (toMs - fromMs) / columns || 1;
    if (good.length <= 2 * columns) {
      for (const r of good) {
        out.epochMs.push(r.epoch_ms);
        lists(out).forEach((l, j) => l.push(r[keys[j]!]));
      }
    } else {
      // Per column: (first epoch, each series' minimum), (last epoch, each series' maximum); one point if alone.
      let i = 0;
      while (i < good.length) {
        const col = Math.min(columns - 1, Math.floor((good[i].epoch_ms - fromMs) / width));
        let end = i + 1;
        while (end < good.length && Math.min(columns - 1, Math.floor((good[end].epoch_ms - fromMs) / width)) === col) end++;
        const block = good.slice(i, end);
        if (block.length === 1) {
          out.epochMs.push(block[0].epoch_ms);
          lists(out).forEach((l, j) => l.push(block[0][keys[j]!]));
        } else {
          out.epochMs.push(block[0].epoch_ms, block[block.length - 1].epoch_ms);
          lists(out).forEach((l, j) => {
            let lo = Infinity,
              hi = -Infinity;
            for (const r of block) {
              const v = r[keys[j]!] as number;
              if (v < lo) lo = v;
              if (v > hi) hi = v;
            }
            l.push(lo, hi);
          });
        }
        i = end;
      }
    }
    res.json({ series: out, outliers });
  };
}

const trend: Benchmark = {
  id: 'trend.api',
  goal: 2,
  better: 'lower',
  async run(ctx) {
    const N = 20_000;
    const COLUMNS = 1000;
    const d = await freshDatabase(ctx);
    try {
      const { agent, csrf } = await appOn(d);
      const craftId = await createCraft(agent, csrf, 91000);
      const started = await agent
        .post(`/api/orbit/spacecraft/${craftId}/uploads`)
        .set('x-csrf-token', csrf)
        .attach('file', Buffer.from(fileOf(sets(N, 91000))), 'bench.tle')
        .expect(202);
      await settle(agent, started.body.upload.id, started.body.upload.version);
      const importing = await agent
        .post(`/api/orbit/uploads/${started.body.upload.id}/import`)
        .set('x-csrf-token', csrf)
        .send({})
        .expect(202);
      const done = await settle(agent, started.body.upload.id, importing.body.upload.version);
      if (done.importedCount !== N) throw new Error(`imported ${done.importedCount}`);
      const ours: number[] = [],
        cached: number[] = [],
        bare: number[] = [];
      const c0 = performance.now();
      const first = await agent.get(`/api/orbit/spacecraft/${craftId}/trend`).query({ columns: COLUMNS }).expect(200);
      const coldMs = performance.now() - c0;
      const lastMs = first.body.window.toMs as number;
      if (first.body.extent.total !== N || !first.body.view.reduced) throw new Error('the trend did not reduce the whole history');
      // Same rows over HTTP both ways: the bare side is a plain route that selects them, reduces them the same way and
      // sends them as JSON.
      const express = (await import('express')).default;
      const bareApp = express();
      bareApp.get('/trend', bareTrendHandler(d.pool, craftId, COLUMNS));
      const bareAgent = request(bareApp);
      const same = (a: SeriesReply, b: SeriesReply) => JSON.stringify(a) === JSON.stringify(b);
      // The ratio is of the uncached computation: every round asks for a rate window the endpoint has not seen (the
      // default 30 days with its end moved on by k ms: the same sets), so the window rates are computed afresh each time.
      const windowOf = (k: number) => ({
        from: new Date(lastMs - 30 * DAY_MS).toISOString(),
        to: new Date(lastMs + k).toISOString(),
        columns: COLUMNS,
      });
      for (let k = 0; k < 12; k++) {
        const runOurs = async () => {
          const t0 = performance.now();
          const r = await agent
            .get(`/api/orbit/spacecraft/${craftId}/trend`)
            .query(windowOf(k + 1))
            .expect(200);
          const ms = performance.now() - t0;
          if (r.body.rates === null || r.body.counts.inWindow !== first.body.counts.inWindow) throw new Error('trend window differs');
          return { ms, body: r.body as { series: SeriesReply; outliers: SeriesReply } };
        };
        const runBare = async () => {
          const t1 = performance.now();
          const b = await bareAgent.get('/trend').expect(200);
          return { ms: performance.now() - t1, body: b.body as { series: SeriesReply; outliers: SeriesReply } };
        };
        // Alternate which side goes first.
        let o: Awaited<ReturnType<typeof runOurs>>, b: Awaited<ReturnType<typeof runBare>>;
        if (k % 2 === 0) {
          o = await runOurs();
          b = await runBare();
        } else {
          b = await runBare();
          o = await runOurs();
        }
        if (!same(o.body.series, b.body.series)) throw new Error('the trend and the bare reduction answer different series');
        if (!same(o.body.outliers, b.body.outliers)) throw new Error('the trend and the bare reduction answer different outliers');
        if (k > 1) {
          ours.push(o.ms);
          bare.push(b.ms);
        }
        // The same window again: the cached rates.
        const t2 = performance.now();
        await agent
          .get(`/api/orbit/spacecraft/${craftId}/trend`)
          .query(windowOf(k + 1))
          .expect(200);
        if (k > 1) cached.push(performance.now() - t2);
      }
      const o = median(ours),
        b = median(bare),
        c = median(cached);
      return {
        ratio: median(ours.map((x, k) => x / bare[k]!)),
        detail: `${N.toLocaleString('en-GB')} sets reduced to min/max per ${COLUMNS} pixel columns (${first.body.series.epochMs.length} points): uncached trend endpoint ${o.toFixed(1)} ms (+ rate fit of a window not seen before) vs bare SELECT + the same reduction as JSON ${b.toFixed(1)} ms; both answer identical series, checked each round (median of 10 per-round ratios, sides alternating first; cached window ${c.toFixed(1)} ms; first call after the import ${coldMs.toFixed(0)} ms); ${ctx.durability}`,
      };
    } finally {
      await d.drop();
    }
  },
};

/**
 * history.csv: the element-set history export a user downloads (every stored set of a spacecraft, newest first), through
 * the app, against a bare Express route running one SELECT of the same columns and writing the same CSV text.
 */
const historyCsv: Benchmark = {
  id: 'history.csv',
  goal: 1.5,
  better: 'lower',
  async run(ctx) {
    const N = 20_000;
    const d = await freshDatabase(ctx);
    try {
      const { agent, csrf } = await appOn(d);
      const craftId = await createCraft(agent, csrf, 92000);
      await importThroughApi(agent, csrf, craftId, fileOf(sets(N, 92000)), N);
      const express = (await import('express')).default;
      const bareApp = express();
      // The one column of user text (the file name) made inert and quoted when it must be, as every CSV must be;
      // the other columns are numbers and ISO times the code writes itself.
      const textCell = (v: string) => {
        const inert = /^[=+\-@\t\r]/.test(v) ? `'${v}` : v;
        return /[",\r\n]/.test(inert) ? `"${inert.replace(/"/g, '""')}"` : inert;
      };
      bareApp.get('/history.csv', async (_req, res) => {
        const { rows } = await d.pool.query(
          `select s.epoch, s.element_set_no, s.semi_major_axis_km, s.eccentricity, s.inclination_deg, s.apogee_altitude_km, s.perigee_altitude_km,
                  s.bstar, s.outlier, f.filename, s.source_line
           from element_sets s join element_set_files f on f.id = s.file_id
           where s.spacecraft_id = $1 order by s.epoch desc, s.id desc`,
          [craftId],
        );
        const lines = [
          'epoch_utc,element_set_no,semi_major_axis_km,eccentricity,inclination_deg,apogee_altitude_km,perigee_altitude_km,bstar_per_earth_radius,outlier,source_file,source_line',
        ];
        for (const r of rows)
          lines.push(
            [
              (r.epoch as Date).toISOString(),
              r.element_set_no,
              r.semi_major_axis_km.toFixed(4),
              r.eccentricity.toFixed(7),
              r.inclination_deg.toFixed(4),
              r.apogee_altitude_km.toFixed(4),
              r.perigee_altitude_km.toFixed(4),
              r.bstar.toExponential(5),
              r.outlier,
              textCell(r.filename),
              r.source_line,
            ].join(','),
          );
        res.type('text/csv').send(lines.join('\r\n') + '\r\n');
      });
      const bareAgent = request(bareApp);
      const ours: number[] = [],
        bare: number[] = [],
        ratios: number[] = [];
      const texts = { ours: '', bare: '' };
      for (let k = 0; k < 9; k++) {
        // Alternate which side goes first.
        const runOurs = async () => {
          const t0 = performance.now();
          const r = await agent.get(`/api/orbit/spacecraft/${craftId}/element-sets.csv`).expect(200);
          const ms = performance.now() - t0;
          if (r.text.split('\r\n').length !== N + 2) throw new Error('export lost rows');
          texts.ours = r.text;
          return ms;
        };
        const runBare = async () => {
          const t0 = performance.now();
          const r = await bareAgent.get('/history.csv').expect(200);
          const ms = performance.now() - t0;
          if (r.text.split('\r\n').length !== N + 2) throw new Error('bare export lost rows');
          texts.bare = r.text;
          return ms;
        };
        let o: number, b: number;
        if (k % 2 === 0) {
          o = await runOurs();
          b = await runBare();
        } else {
          b = await runBare();
          o = await runOurs();
        }
        if (texts.ours !== texts.bare) throw new Error('the export and the bare CSV differ');
        if (k === 0) continue; // warm-up
        ours.push(o);
        bare.push(b);
        ratios.push(o / b);
      }
      return {
        ratio: median(ratios),
        detail: `${N.toLocaleString('en-GB')} sets: history CSV export through the app ${median(ours).toFixed(0)} ms vs bare Express + one SELECT + the same CSV text ${median(bare).toFixed(0)} ms (byte-identical, checked each round; median of 8 per-round ratios, sides alternating first); ${ctx.durability}`,
      };
    } finally {
      await d.drop();
    }
  },
};

export const benchmarks: Benchmark[] = [ingest, trend, historyCsv];
