// dispatch.fan-out: a dispatch e-mailed to 10,000 members through the product's path — publish over HTTP, the
// pg-boss fan-out job writing the mail queue, the mail sender rendering each message and sending batches
// through the resend SDK to the local mail fake — timed from the publish request to the last message accepted.
// Ratio (the measure) = our delivered messages per second ÷ the mail fake's raw batch-acceptance rate in
// the same run: the same number of messages as pre-built payloads, the same batch size and calls in flight, no
// database and no rendering — how close the whole path comes to what the mail service itself can take. Each
// round's raw run is measured right beside that round's fan-out, so both meet the same load on a shared machine.
// Beside it, a same-work bare loop without the machinery: the same recipients query, the same per-member data
// rows written to a plain table in one transaction, the same template rendered per message (through the same
// renderer), the same batch calls (size, idempotency key, concurrency) through the same SDK to the same fake,
// each batch marked sent in its own commit, on the same cluster (same durability). The web process's latency is
// probed throughout. As `npm start` runs them, the web app (here with the mail fake beside it) and the worker
// (fan-out job and mail sender, `npm run worker`) are separate processes; the detail reports each one's CPU time.
import type { ChildProcess } from 'node:child_process';
import { mkdtempSync, readFileSync, readdirSync } from 'node:fs';
import type { Server } from 'node:http';
import os from 'node:os';
import path from 'node:path';
import pg from 'pg';
import pino from 'pino';
import request from 'supertest';
import { Resend } from 'resend';
import { loadConfig } from '../../server/config';
import { createApp } from '../../server/app';
import { createDb } from '../../server/db/client';
import { createJobs } from '../../server/jobs';
import { createMailerFromConfig, createStripeFromConfig } from '../../server/deps';
import { DEMO_PASSWORD, seedDemoAccounts } from '../../server/demo/accounts';
import { createMailFake } from '../../fakes/mail/server';
import { spawnWorkerProcess } from '../setup/worker-process';
import { renderEmail } from '../../emails/render';
import { resolveRecipients } from '../../server/modules/dispatches/audience';
import { listUnsubscribeHeaders, unsubscribeUrls } from '../../server/modules/dispatches/dispatch-sending';
import { campaigns, tiers } from '../../server/modules/campaigns/campaigns.tables';
import { median, type Benchmark } from './harness';

const N = 10_000;
/** Members of the warm-up dispatch: its round loads and compiles the worker's code paths, like the renders below. */
const WARM_UP = 200;
const TITLE = 'Ten thousand backers: the sail at full stretch';

function percentile(values: number[], p: number): number {
  const s = [...values].sort((a, b) => a - b);
  return s[Math.min(s.length - 1, Math.floor((p / 100) * s.length))] ?? NaN;
}

/** GETs a public page one request after another until stopped; returns each latency in ms. */
function probeLatency(url: string) {
  const times: number[] = [];
  let running = true;
  const done = (async () => {
    while (running) {
      const t0 = performance.now();
      const res = await fetch(url);
      await res.arrayBuffer();
      if (!res.ok) throw new Error(`probe answered ${res.status}`);
      times.push(performance.now() - t0);
      await new Promise((r) => setTimeout(r, 20));
    }
  })();
  return {
    stop: async () => {
      running = false;
      await done;
      return times;
    },
  };
}

/** User + system CPU seconds a process has used so far (Linux /proc; clock ticks of 1/100 s). */
function cpuSeconds(pid: number): number {
  const fields = readFileSync(`/proc/${pid}/stat`, 'utf8')
    .replace(/^.*\) /, '')
    .split(' ');
  return (Number(fields[11]) + Number(fields[12])) / 100;
}

/** CPU seconds used so far by every live child of a process (here: the PostgreSQL cluster's backends). */
function childrenCpuSeconds(parentPid: number): number {
  let total = 0;
  for (const entry of readdirSync('/proc')) {
    if (!/^\d+$/.test(entry)) continue;
    try {
      const fields = readFileSync(`/proc/${entry}/stat`, 'utf8')
        .replace(/^.*\) /, '')
        .split(' ');
      if (Number(fields[1]) === parentPid) total += (Number(fields[11]) + Number(fields[12])) / 100;
    } catch {
      // the process ended while the list was read
    }
  }
  return total;
}

function withinMs<T>(work: Promise<T>, ms: number, what: string): Promise<T> {
  let timer: NodeJS.Timeout | undefined;
  const late = new Promise<never>((_, reject) => {
    timer = setTimeout(() => reject(new Error(`${what} did not answer within ${ms / 1000} s`)), ms);
  });
  return Promise.race([work, late]).finally(() => clearTimeout(timer));
}

async function waitUntil(check: () => boolean | Promise<boolean>, ms: number) {
  const until = Date.now() + ms;
  while (!(await check())) {
    if (Date.now() > until) throw new Error('timed out');
    await new Promise((r) => setTimeout(r, 25));
  }
}

export const benchmarks: Benchmark[] = [
  {
    id: 'dispatch.fan-out',
    goal: 0.8,
    better: 'higher',
    run: async ({ pgAdminUrl, pgTemplate, log }) => {
      const dbName = `bench_fanout_${process.pid}`;
      const admin = new pg.Client({ connectionString: pgAdminUrl });
      await admin.connect();
      await admin.query(`DROP DATABASE IF EXISTS ${dbName}`);
      await admin.query(`CREATE DATABASE ${dbName} TEMPLATE ${pgTemplate}`);
      const url = pgAdminUrl.replace(/\/[^/]*$/, `/${dbName}`);
      const mail = await createMailFake({ port: 0, apiKey: 're_bench_key' });
      const config = loadConfig({
        NODE_ENV: 'test',
        LOG_LEVEL: 'silent',
        DATABASE_URL: url,
        PUBLIC_URL: 'http://127.0.0.1:3999',
        RESEND_API_KEY: 're_bench_key',
        RESEND_BASE_URL: mail.url,
        SESSION_SECRET: 'bench-session-secret-0123456789',
        UPLOADS_DIR: mkdtempSync(path.join(os.tmpdir(), 'lightkeel-bench-uploads-')),
        // The mail sender wakes on the queue's notification; the poll is only its fallback.
        MAIL_POLL_MS: '2000',
      });
      // Web and worker as `npm start` runs them: the web app with a job sender here, the worker (`npm run
      // worker`: fan-out job and mail sender) in a process of its own on the same database.
      const web = createDb(url, { max: 10 });
      const bare = createDb(url, { max: 10 });
      for (const p of [web.pool, bare.pool]) p.on('error', () => undefined);
      const logger = pino({ level: 'silent' });
      const webJobs = createJobs({ pool: web.pool, db: web.db, config, logger });
      let server: Server | undefined;
      let worker: ChildProcess | undefined;
      try {
        await seedDemoAccounts(web.db);
        const [c] = await web.db
          .insert(campaigns)
          .values({
            slug: 'tern-1-bench',
            title: 'Tern-1 sail campaign',
            goalMinor: 4_800_000,
            currency: 'EUR',
            startsAt: new Date(Date.now() - 86_400_000),
            endsAt: new Date(Date.now() + 30 * 86_400_000),
          })
          .returning();
        const [patch] = await web.db
          .insert(tiers)
          .values({ campaignId: c!.id, title: 'Mission patch', minAmountMinor: 2500, kind: 'one-time', position: 1 })
          .returning();
        await web.pool.query(
          `insert into accounts (email, display_name) select 'm' || g || '@members.example', 'Member ' || g from generate_series(1, $1::int) g`,
          [N],
        );
        await web.pool.query(
          `insert into pledges (campaign_id, tier_id, backer_id, kind, amount_minor, currency, state, idempotency_key)
           select $1, $2, a.id, 'one-time', 2500, 'EUR', 'paid', 'bench-' || a.id from accounts a where a.email like 'm%@members.example'`,
          [c!.id, patch!.id],
        );
        // A small second tier for the worker's warm-up dispatch (untimed).
        const [warmTier] = await web.db
          .insert(tiers)
          .values({ campaignId: c!.id, title: 'Warm-up tier', minAmountMinor: 1000, kind: 'one-time', position: 2 })
          .returning();
        await web.pool.query(
          `insert into pledges (campaign_id, tier_id, backer_id, kind, amount_minor, currency, state, idempotency_key)
           select $1, $2, a.id, 'one-time', 1000, 'EUR', 'paid', 'bench-warm-' || a.id from accounts a
            where a.email like 'm%@members.example' order by a.email limit $3`,
          [c!.id, warmTier!.id, WARM_UP],
        );
        await web.pool.query('analyze');
        log(`seeded ${N} members backing one tier`);

        const { rows: backend } = await web.pool.query<{ pid: number }>('select pg_backend_pid() as pid');
        const postmasterPid = Number(
          readFileSync(`/proc/${backend[0]!.pid}/stat`, 'utf8')
            .replace(/^.*\) /, '')
            .split(' ')[1],
        );
        await webJobs.start();
        worker = await spawnWorkerProcess(config, { MAIL_POLL_MS: config.MAIL_POLL_MS.toString() });
        const workerPid = worker.pid!;
        const app = createApp({
          db: web.db,
          pool: web.pool,
          config,
          jobs: webJobs,
          mailer: createMailerFromConfig(config),
          stripe: createStripeFromConfig(config),
        });
        server = await new Promise<Server>((resolve) => {
          const s = app.listen(0, '127.0.0.1', () => resolve(s));
        });
        const base = `http://127.0.0.1:${(server.address() as { port: number }).port}`;
        const agent = request.agent(app);
        const csrf = async () => (await agent.get('/api/auth/csrf').expect(200)).body.csrfToken as string;
        const signInToken = await csrf();
        await agent
          .post('/api/auth/sign-in')
          .set('x-csrf-token', signInToken)
          .send({ email: 'outreach@saltmarsh.example', password: DEMO_PASSWORD })
          .expect(200);
        const token = await csrf();
        const body = [
          'The sail has been at **full stretch** for ten days.',
          '',
          '- apogee up 1.2 km',
          '- perigee steady',
          '',
          'Thank you for backing the flight.',
        ].join('\n');
        const probeUrl = `${base}/api/public/dispatches`;
        const resend = new Resend(config.RESEND_API_KEY, { baseUrl: mail.url });
        const size = config.DISPATCH_BATCH_SIZE;

        // Warm-up: the template engine's first render loads its modules; neither side should pay for it. The worker
        // process warms up the same way on a small dispatch of its own (fan-out job, renders, batch calls).
        await renderEmail('verify-email', { displayName: 'Warm', verifyUrl: 'http://127.0.0.1:3999/v' });
        {
          const title = `${TITLE} (warm-up)`;
          const created = await agent
            .post('/api/dispatches')
            .set('x-csrf-token', token)
            .send({ title, bodyMarkdown: body, audience: { kind: 'tiers', tierIds: [warmTier!.id] }, emailOnPublish: true })
            .expect(201);
          await agent
            .post(`/api/dispatches/${created.body.dispatch.id}/transition`)
            .set('x-csrf-token', token)
            .send({ to: 'published' })
            .expect(200);
          await waitUntil(async () => {
            const { rows } = await web.pool.query<{ n: number }>(
              `select count(*)::int n from mail_queue where idempotency_key like $1 and state = 'sent'`,
              [`dispatch/${created.body.dispatch.id}/%`],
            );
            return rows[0]!.n === WARM_UP;
          }, 120_000);
        }

        // Idle latency of the web process, before any fan-out.
        const idleProbe = probeLatency(probeUrl);
        await new Promise((r) => setTimeout(r, 2000));
        const idle = await idleProbe.stop();

        /** Ours: a new dispatch published over HTTP; the jobs do the rest. Returns ms and the web latencies meanwhile. */
        const runOurs = async (round: number) => {
          const title = `${TITLE} (round ${round})`;
          const created = await agent
            .post('/api/dispatches')
            .set('x-csrf-token', token)
            .send({ title, bodyMarkdown: body, audience: { kind: 'tiers', tierIds: [patch!.id] }, emailOnPublish: true })
            .expect(201);
          const dispatchId = created.body.dispatch.id as string;
          const ours = (m: { subject: string }) => m.subject === title;
          mail.clear();
          const probe = probeLatency(probeUrl);
          const cpu0 = { worker: cpuSeconds(workerPid), here: process.cpuUsage(), db: childrenCpuSeconds(postmasterPid) };
          const t0 = performance.now();
          await agent.post(`/api/dispatches/${dispatchId}/transition`).set('x-csrf-token', token).send({ to: 'published' }).expect(200);
          await waitUntil(() => mail.messages().some(ours), 600_000);
          const firstMs = performance.now() - t0;
          await waitUntil(() => mail.messages().filter(ours).length >= N, 600_000);
          const ms = performance.now() - t0;
          const here = process.cpuUsage(cpu0.here);
          const cpu = {
            worker: cpuSeconds(workerPid) - cpu0.worker,
            here: (here.user + here.system) / 1e6,
            db: childrenCpuSeconds(postmasterPid) - cpu0.db,
          };
          const latencies = await probe.stop();
          const delivered = mail.messages().filter(ours);
          const perAddress = new Set(delivered.flatMap((m) => m.to));
          if (delivered.length !== N || perAddress.size !== N) throw new Error(`ours: ${delivered.length} messages to ${perAddress.size}`);
          // The fake has every message; the sender's last "sent" commits may still be on their way (not timed).
          let states: { state: string; n: number }[] = [];
          await waitUntil(async () => {
            ({ rows: states } = await web.pool.query<{ state: string; n: number }>(
              `select state, count(*)::int n from mail_queue where template = 'dispatch' and idempotency_key like $1 group by state`,
              [`dispatch/${dispatchId}/%`],
            ));
            return states.length === 1 && states[0]!.state === 'sent';
          }, 30_000).catch(() => {
            throw new Error(`queue states 30 s after the last message: ${JSON.stringify(states)}`);
          });
          log(
            `round ${round} ours: ${(ms / 1000).toFixed(1)} s (${((N / ms) * 1000).toFixed(0)} msg/s), first after ${(firstMs / 1000).toFixed(1)} s; ` +
              `CPU ${cpu.worker.toFixed(1)} s in the worker, ${cpu.here.toFixed(1)} s in the web + mail fake process, ${cpu.db.toFixed(1)} s in PostgreSQL`,
          );
          return { ms, latencies, dispatchId, cpu };
        };

        /** The bare loop: the same recipients, data rows, renders and batch calls, without the queue machinery. */
        const runBare = async (round: number, shared: (round: number) => Record<string, unknown>) => {
          const table = `bare_outbox_${round}`;
          await bare.pool.query(
            `create table ${table} (id bigserial primary key, key text unique not null, batch int not null, to_address text not null,
               data jsonb not null, headers jsonb not null, state text not null default 'queued', provider_id text)`,
          );
          mail.clear();
          // The web process is probed during the baseline too, so both sides share the process with the same load.
          const probe = probeLatency(probeUrl);
          const t1 = performance.now();
          const recipients = await resolveRecipients(bare.db, { kind: 'tiers', tierIds: [patch!.id] });
          const keys: string[] = [];
          const to: string[] = [];
          const data: string[] = [];
          const headers: string[] = [];
          const batchNo: number[] = [];
          recipients.forEach((r, i) => {
            const links = unsubscribeUrls(config, r.accountId);
            keys.push(`bare/${round}/${r.accountId}`);
            to.push(r.email);
            data.push(JSON.stringify({ ...shared(round), unsubscribeUrl: links.page }));
            headers.push(JSON.stringify(listUnsubscribeHeaders(links.oneClick)));
            batchNo.push(Math.floor(i / size));
          });
          const client = await bare.pool.connect();
          try {
            await client.query('begin');
            for (let i = 0; i < keys.length; i += 2000) {
              const s = (a: unknown[]) => a.slice(i, i + 2000);
              await client.query(
                `insert into ${table} (key, batch, to_address, data, headers)
                 select k, b, t, d::jsonb, h::jsonb from unnest($1::text[], $2::int[], $3::text[], $4::text[], $5::text[]) as x(k, b, t, d, h)`,
                [s(keys), s(batchNo), s(to), s(data), s(headers)],
              );
            }
            await client.query('commit');
          } finally {
            client.release();
          }
          const batches = Math.ceil(recipients.length / size);
          let next = 0;
          const sendLoop = async () => {
            for (let b = next++; b < batches; b = next++) {
              const { rows } = await bare.pool.query<{ id: string; to_address: string; data: object; headers: Record<string, string> }>(
                `select id, to_address, data, headers from ${table} where batch = $1 order by id`,
                [b],
              );
              const payloads = [];
              for (const r of rows) {
                const rendered = await renderEmail('dispatch', r.data as never);
                payloads.push({
                  from: config.MAIL_FROM,
                  to: r.to_address,
                  subject: rendered.subject,
                  html: rendered.html,
                  text: rendered.text,
                  headers: r.headers,
                  tags: [{ name: 'template', value: 'dispatch' }],
                });
              }
              // A call that never answers fails the bench in words instead of holding it for ever.
              const { data: sent, error } = await withinMs(
                resend.batch.send(payloads, { idempotencyKey: `bare/${round}/${b}`, batchValidation: 'strict' }),
                120_000,
                `baseline batch ${b}`,
              );
              if (!sent) throw new Error(`baseline batch ${b}: ${error?.message}`);
              await bare.pool.query(
                `update ${table} o set state = 'sent', provider_id = k.pid from unnest($1::bigint[], $2::text[]) as k(id, pid) where o.id = k.id`,
                [rows.map((r) => r.id), sent.data.map((d) => d.id)],
              );
            }
          };
          // The same number of batch calls in flight as the mail sender keeps.
          await Promise.all(Array.from({ length: config.MAIL_SEND_CONCURRENCY }, sendLoop));
          const ms = performance.now() - t1;
          const latencies = await probe.stop();
          const count = new Set(mail.messages().flatMap((m) => m.to)).size;
          if (mail.messages().length !== N || count !== N) throw new Error(`baseline delivered ${mail.messages().length} to ${count}`);
          log(`round ${round} bare: ${(ms / 1000).toFixed(1)} s (${((N / ms) * 1000).toFixed(0)} msg/s)`);
          return { ms, latencies };
        };

        // The fake's raw batch acceptance: the same number of messages as pre-built payloads (copies of the
        // messages our round delivered), the same batch size and calls in flight, no database, no rendering.
        let template: object[] = [];
        const rawRound = async (round: number) => {
          mail.clear();
          const batches = Math.ceil(N / size);
          let next = 0;
          const cpu0 = process.cpuUsage();
          const t2 = performance.now();
          const loop = async () => {
            for (let b = next++; b < batches; b = next++) {
              const { data, error } = await resend.batch.send(template as never, { idempotencyKey: `raw/${round}/${b}` });
              if (!data) throw new Error(`raw batch ${b}: ${error?.message}`);
            }
          };
          await Promise.all(Array.from({ length: config.MAIL_SEND_CONCURRENCY }, loop));
          const ms = performance.now() - t2;
          const cpu = process.cpuUsage(cpu0);
          if (mail.messages().length !== batches * size) throw new Error(`raw: ${mail.messages().length} accepted`);
          log(
            `round ${round} raw: ${(ms / 1000).toFixed(1)} s (${((N / ms) * 1000).toFixed(0)} msg/s), CPU ${((cpu.user + cpu.system) / 1e6).toFixed(1)} s`,
          );
          return ms;
        };

        // Two rounds, the order swapped in the second (ours, raw, bare | bare, raw, ours), so load on a shared
        // machine hits the sides alike; each round's ratio compares ours with the raw run right beside it.
        const first = await runOurs(1);
        template = mail
          .messages()
          .slice(0, size)
          .map((m) => ({ from: m.from, to: m.to, subject: m.subject, html: m.html, text: m.text }));
        const raw1 = await rawRound(1);
        const { rows: sample } = await web.pool.query<{ data: Record<string, unknown> }>(
          `select coalesce(s.data, '{}'::jsonb) || m.data as data from mail_queue m left join mail_shared s on s.key = m.shared_key
            where m.idempotency_key like $1 limit 1`,
          [`dispatch/${first.dispatchId}/%`],
        );
        // The whole data of a real message (its shared part and its own fields), minus its own link: the baseline
        // builds the same rows from it, each carrying all of it.
        const shared = (round: number) => ({ ...sample[0]!.data, title: `${TITLE} (bare round ${round})` });
        const bare1 = await runBare(1, shared);
        const bare2 = await runBare(2, shared);
        const raw2 = await rawRound(2);
        const rounds = [
          { ours: first, bare: bare1, rawMs: raw1 },
          { ours: await runOurs(2), bare: bare2, rawMs: raw2 },
        ];
        // Two more rounds of ours and raw alone (ours, raw | raw, ours): on a shared 2-core machine one round's ratio
        // swings by ±0.2, and the median of four holds better than the mean of two.
        const pairs = rounds.map((r) => ({ oursMs: r.ours.ms, rawMs: r.rawMs }));
        const oursThen = async (round: number) => {
          const ours = await runOurs(round);
          pairs.push({ oursMs: ours.ms, rawMs: await rawRound(round) });
        };
        const rawThen = async (round: number) => {
          const rawMs = await rawRound(round);
          pairs.push({ oursMs: (await runOurs(round)).ms, rawMs });
        };
        await oursThen(3);
        await rawThen(4);
        const sameWork = rounds.map((r) => r.bare.ms / r.ours.ms);
        const rawMs = median(pairs.map((r) => r.rawMs));
        const rawRate = (N / rawMs) * 1000;
        const ratios = pairs.map((r) => r.rawMs / r.oursMs);
        const ratio = median(ratios);

        const rate = (ms: number) => ((N / ms) * 1000).toFixed(0);
        const oursMs = median(pairs.map((r) => r.oursMs));
        const bareMs = median(rounds.map((r) => r.bare.ms));
        const busy = rounds.flatMap((r) => r.ours.latencies);
        const bareBusy = rounds.flatMap((r) => r.bare.latencies);
        const p = (v: number[]) =>
          `p50 ${median(v).toFixed(1)} ms, p95 ${percentile(v, 95).toFixed(1)} ms, max ${Math.max(...v).toFixed(0)} ms`;
        const detail =
          `${N} members, ${pairs.length} rounds (the same-work bare loop in the first two): ours ${rate(oursMs)} msg/s ÷ the fake's raw acceptance ${rawRate.toFixed(0)} msg/s ` +
          `(rounds ${ratios.map((r) => r.toFixed(2)).join(', ')}); same-work bare loop ${rate(bareMs)} msg/s, ours ÷ bare ` +
          `${sameWork.map((r) => r.toFixed(2)).join(', ')}; CPU per round of ours: worker process ` +
          `${rounds.map((r) => r.ours.cpu.worker.toFixed(1)).join(', ')} s, web + mail fake process ` +
          `${rounds.map((r) => r.ours.cpu.here.toFixed(1)).join(', ')} s, PostgreSQL ${rounds.map((r) => r.ours.cpu.db.toFixed(1)).join(', ')} s; ` +
          `web latency idle ${p(idle)} (n=${idle.length}), ` +
          `during our fan-out ${p(busy)} (n=${busy.length}), during the bare loop ${p(bareBusy)} (n=${bareBusy.length})`;
        log(detail);
        return { ratio, detail };
      } finally {
        await new Promise((r) => (server ? server.close(r) : r(undefined)));
        if (worker && worker.exitCode === null) {
          const exited = new Promise((r) => worker!.once('exit', r));
          worker.kill('SIGTERM');
          await withinMs(exited, 30_000, 'the worker process').catch(() => worker!.kill('SIGKILL'));
        }
        await webJobs.stop().catch(() => undefined);
        await Promise.all([web.pool.end(), bare.pool.end()]);
        await mail.close();
        await admin.query(`DROP DATABASE IF EXISTS ${dbName} WITH (FORCE)`).catch(() => undefined);
        await admin.end();
      }
    },
  },
];
