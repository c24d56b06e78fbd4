// campaign.read: the public campaign endpoint of the full app (sessions, helmet, logging, CSRF, the 3 s
// read cache) against a bare Express + pg handler running the same one-row query, under 50 connections.
import type { Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import autocannon from 'autocannon';
import express from 'express';
import pg from 'pg';
import { loadConfig } from '../../server/config';
import { createApp } from '../../server/app';
import { createDb } from '../../server/db/client';
import { createMailerFromConfig, createStripeFromConfig } from '../../server/deps';
import { seedDemoAccounts } from '../../server/demo/accounts';
import { campaignSeeder } from '../../server/demo/campaign-seed';
import { campaignReadSql } from '../../server/modules/campaigns/campaign-read.sql';
import type { Benchmark } from './harness';

const CONNECTIONS = 50;
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
    goal: 0.5,
    better: 'higher',
    run: async ({ pgAdminUrl, pgTemplate, log }) => {
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
          LOG_LEVEL: 'silent',
          DATABASE_URL: url,
          PUBLIC_URL: 'http://127.0.0.1:3999',
          STRIPE_API_BASE_URL: 'http://127.0.0.1:9',
        };
        const { db, pool } = createDb(url, { max: 20 });
        pool.on('error', () => undefined); // the final DROP … WITH (FORCE) ends idle connections
        closers.push(() => pool.end());
        const config = loadConfig(env);
        const accountIds = await seedDemoAccounts(db);
        await campaignSeeder.run({ db, config, log: () => undefined, accountIds });

        const ours = await listen(
          createApp({ db, pool, config, mailer: createMailerFromConfig(config), stripe: createStripeFromConfig(config) }),
        );
        closers.push(() => new Promise((r) => ours.server.close(r)));
        const uncachedConfig = loadConfig({ ...env, CAMPAIGN_CACHE_MS: '0' });
        const uncached = await listen(
          createApp({
            db,
            pool,
            config: uncachedConfig,
            mailer: createMailerFromConfig(uncachedConfig),
            stripe: createStripeFromConfig(uncachedConfig),
          }),
        );
        closers.push(() => new Promise((r) => uncached.server.close(r)));

        const barePool = new pg.Pool({ connectionString: url, max: 20 });
        barePool.on('error', () => undefined);
        closers.push(() => barePool.end());
        const bareApp = express();
        bareApp.get('/api/campaigns/:slug', async (req, res) => {
          const r = await barePool.query(campaignReadSql, [req.params.slug]);
          if (!r.rows[0]) return void res.status(404).json({ error: 'not found' });
          res.json({ campaign: r.rows[0].campaign });
        });
        const bare = await listen(bareApp);
        closers.push(() => new Promise((r) => bare.server.close(r)));

        const path = '/api/campaigns/tern-1';
        for (const u of [ours.url, uncached.url, bare.url]) {
          const res = await fetch(u + path);
          if (res.status !== 200) throw new Error(`${u}${path} answered ${res.status}`);
          await load(u + path, 1); // warm-up
        }
        const b = await load(bare.url + path);
        const o = await load(ours.url + path);
        const n = await load(uncached.url + path);
        log(`bare express+pg: ${b.rps.toFixed(0)} req/s (p99 ${b.p99} ms, ${b.errors} errors)`);
        log(`lightkeel (3 s cache): ${o.rps.toFixed(0)} req/s (p99 ${o.p99} ms, ${o.errors} errors)`);
        log(`lightkeel (no cache): ${n.rps.toFixed(0)} req/s (p99 ${n.p99} ms, ${n.errors} errors)`);
        if (o.errors + b.errors + n.errors > 0)
          throw new Error(`errors under load: ours ${o.errors}, uncached ${n.errors}, bare ${b.errors}`);
        return {
          ratio: o.rps / b.rps,
          detail: `${CONNECTIONS} conns × ${DURATION_S} s: ours ${o.rps.toFixed(0)} rps vs bare ${b.rps.toFixed(0)} rps; without the read cache ${n.rps.toFixed(0)} rps (${(n.rps / b.rps).toFixed(2)}×); 0 errors`,
        };
      } finally {
        for (const c of closers.reverse()) await c().catch(() => undefined);
        await admin.query(`DROP DATABASE IF EXISTS ${dbName} WITH (FORCE)`).catch(() => undefined);
        await admin.end();
      }
    },
  },
];
