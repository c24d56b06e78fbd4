// books.reconcile: a reconciliation run over 100k processor balance transactions (seeded straight into the
// payment fake) and 100k ledger charges with their fee rows, against a bare baseline that loads the same
// transactions the same way (SDK auto-pagination into a table, same batch size) and runs one plain SQL join.
import pg from 'pg';
import Stripe from 'stripe';
import { sql } from 'drizzle-orm';
import { createDb } from '../../server/db/client';
import { createPaymentsFake } from '../../fakes/payments/server';
import { createProcessor } from '../../server/modules/payments/processor';
import { createReconciliationService } from '../../server/modules/books/reconciliation.service';
import { reconRuns } from '../../server/modules/books/books.tables';
import type { Benchmark } from './harness';

const N = 100_000;

export const benchmarks: Benchmark[] = [
  {
    id: 'books.reconcile',
    goal: 2,
    better: 'lower',
    run: async ({ pgAdminUrl, pgTemplate, log }) => {
      const dbName = `bench_books_${process.pid}`;
      const admin = new pg.Client({ connectionString: pgAdminUrl });
      await admin.connect();
      await admin.query(`DROP DATABASE IF EXISTS ${dbName}`);
      await admin.query(`CREATE DATABASE ${dbName} TEMPLATE ${pgTemplate}`);
      const url = pgAdminUrl.replace(/\/[^/]*$/, `/${dbName}`);
      const { db, pool } = createDb(url, { max: 10 });
      pool.on('error', () => undefined);
      const fake = await createPaymentsFake({ port: 0, webhookSecret: 'whsec_bench', apiKey: 'sk_bench', autoPayouts: false, log: false });
      try {
        const seeded = fake.seed.charges(N, { amountMinor: 2500 });
        const state = fake.state();
        const bts = new Map(state.collections.balance_transaction.map((b) => [b.id, b]));
        const ids = seeded.map((s) => s.chargeId);
        const btIds = seeded.map((s) => s.balanceTransactionId);
        const created = seeded.map((s) => new Date(bts.get(s.balanceTransactionId)!.created * 1000).toISOString());
        const fees = seeded.map((s) => -bts.get(s.balanceTransactionId)!.fee);
        // Whole arrays as one parameter each (drizzle's sql`` would spread an array into one parameter per item).
        await pool.query(
          `insert into ledger_entries (kind, amount_minor, currency, processor_object_id, processor_charge_id, processor_balance_transaction_id, occurred_at)
           select 'charge', 2500, 'USD', c, c, b, t::timestamptz from unnest($1::text[], $2::text[], $3::text[]) as x(c, b, t)`,
          [ids, btIds, created],
        );
        await pool.query(
          `insert into ledger_entries (kind, amount_minor, currency, processor_object_id, processor_charge_id, processor_balance_transaction_id, occurred_at)
           select 'fee', f, 'USD', b, c, b, t::timestamptz from unnest($1::text[], $2::text[], $3::text[], $4::int[]) as x(c, b, t, f)`,
          [ids, btIds, created, fees],
        );
        await pool.query('analyze ledger_entries');
        log(`seeded ${N} processor charges and ${2 * N} ledger rows`);

        const stripe = new Stripe('sk_bench', { host: '127.0.0.1', port: fake.port, protocol: 'http' });
        const recon = createReconciliationService({ db, processor: createProcessor({ db, stripe }) });
        const from = new Date(Date.now() - 3 * 86_400_000);
        const to = new Date(Date.now() + 86_400_000);

        const t0 = performance.now();
        const [run] = await db.insert(reconRuns).values({ fromAt: from, toAt: to }).returning();
        const summary = await recon.execute(run!.id);
        const oursMs = performance.now() - t0;
        if (summary?.matched !== N) throw new Error(`expected ${N} matched, got ${summary?.matched}`);

        // Baseline: the same SDK pagination into a bare table, the same batch size, then one join.
        await db.execute(sql`create unlogged table bare_bt (id text primary key, source text, amount bigint, fee bigint, currency text)`);
        const t1 = performance.now();
        let batch: string[][] = [];
        const flush = async () => {
          if (!batch.length) return;
          await pool.query('insert into bare_bt select * from unnest($1::text[], $2::text[], $3::bigint[], $4::bigint[], $5::text[])', [
            batch.map((b) => b[0]),
            batch.map((b) => b[1]),
            batch.map((b) => b[2]),
            batch.map((b) => b[3]),
            batch.map((b) => b[4]),
          ]);
          batch = [];
        };
        const range = { gte: Math.floor(from.getTime() / 1000), lt: Math.floor(to.getTime() / 1000) };
        for await (const bt of stripe.balanceTransactions.list({ created: range, limit: 100 })) {
          batch.push([bt.id, String(bt.source), String(bt.amount), String(bt.fee), bt.currency.toUpperCase()]);
          if (batch.length >= 2000) await flush();
        }
        await flush();
        const joined = await db.execute<{ n: string }>(sql`
          select count(*)::text as n from bare_bt b join ledger_entries l on l.processor_object_id = b.source and l.kind = 'charge'
          where l.amount_minor = b.amount and l.currency = b.currency`);
        const bareMs = performance.now() - t1;
        if (Number(joined.rows[0]!.n) !== N) throw new Error(`baseline matched ${joined.rows[0]!.n}`);
        const ratio = oursMs / bareMs;
        return {
          ratio,
          detail: `reconcile ${N}: ${oursMs.toFixed(0)} ms (fetch, stage, match, findings, totals) vs SDK load + bare join ${bareMs.toFixed(0)} ms`,
        };
      } finally {
        await fake.close();
        await pool.end();
        await admin.query(`DROP DATABASE IF EXISTS ${dbName}`);
        await admin.end();
      }
    },
  },
];
