// campaign.read: the public campaign endpoint of the full app (sessions, helmet, CSRF, validation) with its read
// cache off, against a bare Express + pg handler running the same one-row query and building the same view, under
// 50 connections. Both log each request as `npm start` does (pino-http at its default level, one line per request),
// written to /dev/null so the bench output stays readable. The app with its 3 s read cache is reported beside it.
import type { Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import autocannon from 'autocannon';
import express from 'express';
import pg from 'pg';
import pino from 'pino';
import { pinoHttp } from 'pino-http';
import { loadConfig } from '../../server/config';
import { createApp } from '../../server/app';
import { createDb } from '../../server/db/client';
import { createMailerFromConfig, createStripeFromConfig } from '../../server/deps';
import { seedDemoAccounts } from '../../server/demo/accounts';
import { campaignSeeder } from '../../server/demo/campaign-seed';
import { campaignReadSql, type CampaignReadRow } from '../../server/modules/campaigns/campaign-read.sql';
import { campaignViewOf } from '../../server/modules/campaigns/campaigns.service';
import { median, type Benchmark } from './harness';

const CONNECTIONS = 50;
const ROUNDS = 4;

/** The production logger: `npm start` leaves LOG_LEVEL at the config default; lines go to /dev/null here. */
function productionLogger(level: string) {
  return pino({ level }, pino.destination({ dest: '/dev/null', sync: true }));
}
const DURATION_S = 6;

function listen(app: express.Express): Promise<{ server: Server; url: string }> {
  return new Promise((resolve) => {
    const server = app.listen(0, '127.0.0.1', () => resolve({ server, url: `http://127.0.0.1:${(server.address() as AddressInfo).port}` }));
  });
}

async function load(url: string, seconds = DURATION_S) {
  const r = await autocannon({ url, connections: CONNECTIONS, duration: seconds, pipelining: 1 });
  return { rps: r.requests.average, errors: r.errors + r.timeouts + r.non2xx, p99: r.latency.p99 };
}

export const benchmarks: Benchmark[] = [
  {
    id: 'campaign.read',
    goal: 0.9,
    better: 'higher',
    run: async ({ pgAdminUrl, pgTemplate, log, durability }) => {
      const dbName = `bench_campaign_${process.pid}`;
      const admin = new pg.Client({ connectionString: pgAdminUrl });
      await admin.connect();
      await admin.query(`DROP DATABASE IF EXISTS ${dbName}`);
      await admin.query(`CREATE DATABASE ${dbName} TEMPLATE ${pgTemplate}`);
      const url = pgAdminUrl.replace(/\/[^/]*$/, `/${dbName}`);
      const closers: Array<() => Promise<unknown>> = [];
      try {
        const env = {
          NODE_ENV: 'development', // production refuses the local secrets and fakes
          DATABASE_URL: url,
          PUBLIC_URL: 'http://127.0.0.1:3999',
          STRIPE_API_BASE_URL: 'http://127.0.0.1:9',
        };
        const { db, pool } = createDb(url, { max: 20 });
        pool.on('error', () => undefined); // the final DROP … WITH (FORCE) ends idle connections
        closers.push(() => pool.end());
        const config = loadConfig(env);
        const level = config.LOG_LEVEL; // what npm start runs with: the config default
        const accountIds = await seedDemoAccounts(db);
        await campaignSeeder.run({ db, config, log: () => undefined, accountIds });

        const cached = await listen(
          createApp({
            db,
            pool,
            config,
            logger: productionLogger(level),
            mailer: createMailerFromConfig(config),
            stripe: createStripeFromConfig(config),
          }),
        );
        closers.push(() => new Promise((r) => cached.server.close(r)));
        const uncachedConfig = loadConfig({ ...env, CAMPAIGN_CACHE_MS: '0' });
        const uncached = await listen(
          createApp({
            db,
            pool,
            config: uncachedConfig,
            logger: productionLogger(level),
            mailer: createMailerFromConfig(uncachedConfig),
            stripe: createStripeFromConfig(uncachedConfig),
          }),
        );
        closers.push(() => new Promise((r) => uncached.server.close(r)));

        // The bare side: Express, the same request logging, its own pool of the same size, the same query and view.
        const barePool = new pg.Pool({ connectionString: url, max: 20 });
        barePool.on('error', () => undefined);
        closers.push(() => barePool.end());
        const bareApp = express();
        bareApp.use(
          pinoHttp({
            logger: productionLogger(level),
            serializers: {
              req: (req: { id: unknown; method: string; url: string }) => ({ id: req.id, method: req.method, url: req.url }),
              res: (res: { statusCode: number }) => ({ statusCode: res.statusCode }),
            },
          }),
        );
        bareApp.get('/api/campaigns/:slug', async (req, res) => {
          const r = await barePool.query<{ campaign: CampaignReadRow }>(campaignReadSql, [req.params.slug]);
          if (!r.rows[0]) return void res.status(404).json({ error: 'not found' });
          res.json({ campaign: campaignViewOf(r.rows[0].campaign, new Date()) });
        });
        const bare = await listen(bareApp);
        closers.push(() => new Promise((r) => bare.server.close(r)));

        const path = '/api/campaigns/tern-1';
        const bodies: string[] = [];
        for (const u of [uncached.url, bare.url, cached.url]) {
          const res = await fetch(u + path);
          if (res.status !== 200) throw new Error(`${u}${path} answered ${res.status}`);
          const body = (await res.json()) as { campaign: Record<string, unknown> & { progress: Record<string, unknown> } };
          delete body.campaign.progress.asOf;
          delete body.campaign.progress.secondsLeft;
          bodies.push(JSON.stringify(body));
          await load(u + path, 1); // warm-up
        }
        if (bodies[0] !== bodies[1]) throw new Error('the bare handler answers a different view');
        // Alternating rounds (uncached app and bare in ABBA order, then the cached app), so load drifts on the shared
        // machine hit all sides alike; the ratio is the median of the per-round ratios.
        const ratios: number[] = [];
        const n: Awaited<ReturnType<typeof load>>[] = [],
          b: Awaited<ReturnType<typeof load>>[] = [],
          o: Awaited<ReturnType<typeof load>>[] = [];
        for (let k = 0; k < ROUNDS; k++) {
          // ABBA: the uncached app goes first in even rounds and second in odd ones.
          if (k % 2 === 0) {
            n.push(await load(uncached.url + path));
            b.push(await load(bare.url + path));
          } else {
            b.push(await load(bare.url + path));
            n.push(await load(uncached.url + path));
          }
          o.push(await load(cached.url + path));
          ratios.push(n[k]!.rps / b[k]!.rps);
          log(
            `round ${k + 1}: uncached ${n[k]!.rps.toFixed(0)} req/s (p99 ${n[k]!.p99} ms), bare ${b[k]!.rps.toFixed(0)} (p99 ${b[k]!.p99} ms), cached ${o[k]!.rps.toFixed(0)} (p99 ${o[k]!.p99} ms)`,
          );
        }
        const errors = [...n, ...b, ...o].reduce((sum, x) => sum + x.errors, 0);
        if (errors > 0) throw new Error(`${errors} errors under load`);
        const rps = (xs: { rps: number }[]) => median(xs.map((x) => x.rps));
        return {
          ratio: median(ratios),
          detail: `${CONNECTIONS} conns × ${DURATION_S} s × ${ROUNDS} alternating rounds, request logs on (level ${level}) both sides: uncached app ${rps(n).toFixed(0)} rps vs bare Express+pg+same view ${rps(b).toFixed(0)} rps; with the 3 s read cache ${rps(o).toFixed(0)} rps (${median(o.map((x, k) => x.rps / b[k]!.rps)).toFixed(2)}×); 0 errors; ${durability}`,
        };
      } finally {
        for (const c of closers.reverse()) await c().catch(() => undefined);
        await admin.query(`DROP DATABASE IF EXISTS ${dbName} WITH (FORCE)`).catch(() => undefined);
        await admin.end();
      }
    },
  },
];
