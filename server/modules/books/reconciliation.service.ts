// A reconciliation run: starting one writes the run row and its job (server/jobs/books-reconcile.ts) in one
// transaction; a worker then pulls the processor's balance transactions through the SDK, one day of the range at
// a time (auto-paginated), stages them in a table and matches them to the ledger in one query by processor ids;
// payouts are summed from the transactions the processor says each contains. Progress is stored as steps
// (done of total: one per day fetched, then matching, then payouts). A retried job keeps the days already
// staged and computes the findings from scratch, so they are never doubled; resolutions are kept by a stable
// key so later runs show them resolved.
import { and, desc, eq, sql } from 'drizzle-orm';
import type Stripe from 'stripe';
import type pg from 'pg';
import type { Db } from '../../db/client';
import type { Processor } from '../payments/processor';
import type { JobSender } from '../../jobs/queue';
import { withTransaction } from '../../lib/pg-transaction';
import { reconFindings, reconProcessorItems, reconResolutions, reconRuns } from './books.tables';
import { pledges } from '../pledges/pledges.tables';
import { recordAudit } from '../audit/audit.repository';
import { appendLedgerEntry } from '../ledger/ledger.repository';
import { lockPledge, recordCharge, recordDispute, recordRefund, refreshPledgeState, type Tx } from '../pledges/pledge-ledger';
import { AppError, conflict, notFound } from '../../errors';
import type { FindingKind, ResolveFindingInput, StartReconciliationInput } from '../../../shared/schemas/books';
import { blockingFindingKinds } from '../../../shared/schemas/books';

const idOf = (v: string | { id: string } | null | undefined) => (typeof v === 'string' ? v : (v?.id ?? null));
const uuidRe = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

/** The ledger kind a balance transaction stands for (null: not money the ledger tracks). */
export function ledgerKindOf(bt: Pick<Stripe.BalanceTransaction, 'type' | 'reporting_category'>): string | null {
  switch (bt.type) {
    case 'charge':
    case 'payment':
      return 'charge';
    case 'refund':
    case 'payment_refund':
      return 'refund';
    case 'payout':
      return 'payout';
    case 'adjustment':
      if (bt.reporting_category === 'dispute') return 'dispute';
      if (bt.reporting_category === 'dispute_reversal') return 'dispute_reversal';
      return null;
    default:
      return null;
  }
}

export const RECONCILE_QUEUE = 'books-reconcile';
/** Where pg-boss puts a reconciliation job whose retries are used up (its worker died on the last attempt). */
export const RECONCILE_GAVE_UP_QUEUE = 'books-reconcile-gave-up';

const STAGE_BATCH = 2000;
const DAY_MS = 86_400_000;

/** The range cut into UTC days (the last one may be shorter): one fetch step each. */
export function daySlices(from: Date, to: Date): { from: Date; to: Date }[] {
  const out: { from: Date; to: Date }[] = [];
  for (let t = from.getTime(); t < to.getTime(); t += DAY_MS)
    out.push({ from: new Date(t), to: new Date(Math.min(t + DAY_MS, to.getTime())) });
  return out;
}
/** Steps of a run: one per day fetched, one for matching, one for the payouts. */
export const stepsOf = (from: Date, to: Date) => daySlices(from, to).length + 2;

const runInProgress = () =>
  conflict(
    'books.run_in_progress',
    'A reconciliation run over some of these days is already waiting or running; wait for it to finish, then start again.',
  );
const jobsUnavailable = () =>
  new AppError(503, 'books.jobs_unavailable', 'Reconciliation runs need the background workers, which this server was started without.');

function isExclusionViolation(err: unknown) {
  let e: unknown = err;
  for (let depth = 0; e && typeof e === 'object' && depth < 5; depth++) {
    if ((e as { code?: unknown }).code === '23P01') return true;
    e = (e as { cause?: unknown }).cause;
  }
  return false;
}

export type RunSummary = {
  fetched: number;
  matched: number;
  findings: Record<string, number>;
  totals: Awaited<ReturnType<ReturnType<typeof createReconciliationService>['totals']>>;
  payouts: { id: string; amountMinor: number; containedMinor: number; currency: string; count: number }[];
};

export type ExecuteOptions = {
  /** This is the job's last attempt: an error marks the run failed (otherwise it waits for the retry). */
  finalAttempt?: boolean;
};

export function createReconciliationService(deps: { db: Db; processor: Processor; pool?: pg.Pool; jobs?: JobSender }) {
  const { db, processor } = deps;
  const stripe = processor.stripe;

  async function setProgress(runId: string, stepsDone: number, stepsTotal: number, label: string, fetchedCount?: number) {
    await db
      .update(reconRuns)
      .set({
        stepsDone,
        stepsTotal,
        progress: Math.round((stepsDone / Math.max(1, stepsTotal)) * 100),
        progressLabel: label,
        ...(fetchedCount === undefined ? {} : { fetchedCount }),
      })
      .where(eq(reconRuns.id, runId));
  }

  /** Pulls the processor's balance transactions of the range into the staging table; answers how many. */
  async function stage(runId: string, from: Date, to: Date, onPage?: (count: number) => Promise<void>) {
    let batch: { id: string; source: string; kind: string; amount: number; fee: number; currency: string; created: number }[] = [];
    let count = 0;
    const flush = async () => {
      if (batch.length === 0) return;
      // One JSON parameter per batch (a multi-row VALUES would bind 8 parameters per row).
      await db.execute(sql`
        insert into recon_processor_items (run_id, balance_transaction_id, source_id, kind, amount_minor, fee_minor, currency, created_at)
        select ${runId}::uuid, b.id, b.source, b.kind, b.amount, b.fee, b.currency, to_timestamp(b.created)
        from jsonb_to_recordset(${JSON.stringify(batch)}::jsonb)
          as b(id text, source text, kind text, amount bigint, fee bigint, currency text, created bigint)
        on conflict do nothing`);
      batch = [];
      await onPage?.(count);
    };
    const created = { gte: Math.floor(from.getTime() / 1000), lt: Math.floor(to.getTime() / 1000) };
    for await (const bt of stripe.balanceTransactions.list({ created, limit: 100 })) {
      const kind = ledgerKindOf(bt);
      if (!kind) continue;
      batch.push({
        id: bt.id,
        source: idOf(bt.source) ?? bt.id,
        kind,
        amount: bt.amount,
        fee: bt.fee,
        currency: bt.currency.toUpperCase(),
        created: bt.created,
      });
      count += 1;
      if (batch.length >= STAGE_BATCH) await flush();
    }
    await flush();
    return count;
  }

  /** The one matching query: processor items against live ledger rows of the range, findings written in place. */
  async function match(runId: string, from: Date, to: Date) {
    await db.execute(sql`
      with l as (
        select id, kind::text as kind, amount_minor, currency, processor_object_id, pledge_id
        from ledger_entries
        where not is_demo and kind in ('charge', 'refund', 'dispute', 'dispute_reversal', 'payout')
          and occurred_at >= ${from.toISOString()}::timestamptz and occurred_at < ${to.toISOString()}::timestamptz
      ),
      p as (select * from recon_processor_items where run_id = ${runId}),
      fees as (
        select processor_object_id, -sum(amount_minor) as fee
        from ledger_entries where kind = 'fee' group by processor_object_id
      ),
      j as (
        select p.balance_transaction_id, p.source_id, p.kind as p_kind, p.amount_minor as p_amount, p.fee_minor as p_fee,
               p.currency as p_currency, l.id as l_id, l.kind as l_kind, l.amount_minor as l_amount, l.currency as l_currency,
               l.processor_object_id as l_object, l.pledge_id, coalesce(f.fee, 0) as l_fee
        from p full join l on l.processor_object_id = p.source_id and l.kind = p.kind
        left join fees f on f.processor_object_id = p.balance_transaction_id
      ),
      found as (
        select case
                 when l_id is null then 'missing_in_ledger'
                 when balance_transaction_id is null then 'missing_at_processor'
                 when p_currency <> l_currency then 'currency_mismatch'
                 when p_amount <> l_amount then 'amount_mismatch'
                 when p_fee <> l_fee then 'fee_mismatch'
               end as kind,
               j.*
        from j
      )
      insert into recon_findings (run_id, kind, subject_key, processor_object_id, ledger_entry_id, pledge_id,
                                  processor_amount_minor, ledger_amount_minor, currency, details)
      select ${runId}, kind,
             case when balance_transaction_id is null then l_object || ':' || l_kind else balance_transaction_id end,
             coalesce(source_id, l_object), l_id, pledge_id,
             case when kind = 'fee_mismatch' then p_fee else p_amount end,
             case when kind = 'fee_mismatch' then l_fee else l_amount end,
             coalesce(p_currency, l_currency),
             jsonb_build_object('ledgerKind', coalesce(p_kind, l_kind), 'balanceTransactionId', balance_transaction_id,
                                'ledgerCurrency', l_currency, 'processorCurrency', p_currency)
      from found where kind is not null
    `);
    // A one-time pledge paid more than once.
    await db.execute(sql`
      insert into recon_findings (run_id, kind, subject_key, pledge_id, ledger_amount_minor, currency, details)
      select ${runId}, 'double_charge', l.pledge_id::text, l.pledge_id, sum(l.amount_minor), min(l.currency),
             jsonb_build_object('charges', jsonb_agg(l.processor_object_id order by l.occurred_at), 'count', count(*))
      from ledger_entries l join pledges pl on pl.id = l.pledge_id
      where l.kind = 'charge' and not l.is_demo and pl.kind = 'one-time'
        and l.occurred_at >= ${from.toISOString()}::timestamptz and l.occurred_at < ${to.toISOString()}::timestamptz
      group by l.pledge_id having count(*) > 1
    `);
    const [row] = await db
      .execute<{ matched: string }>(
        sql`
      select count(*)::text as matched from recon_processor_items p
      join ledger_entries l on l.processor_object_id = p.source_id and l.kind::text = p.kind and not l.is_demo
      where p.run_id = ${runId} and l.amount_minor = p.amount_minor and l.currency = p.currency
    `,
      )
      .then((r) => r.rows);
    return Number(row?.matched ?? 0);
  }

  async function payouts(runId: string, from: Date, to: Date) {
    const created = { gte: Math.floor(from.getTime() / 1000), lt: Math.floor(to.getTime() / 1000) };
    const out: { id: string; amountMinor: number; containedMinor: number; currency: string; count: number }[] = [];
    for await (const po of stripe.payouts.list({ created, limit: 100 })) {
      let contained = 0;
      let count = 0;
      const ids: string[] = [];
      for await (const bt of stripe.balanceTransactions.list({ payout: po.id, limit: 100 })) {
        if (bt.type === 'payout') continue;
        contained += bt.net;
        count += 1;
        if (ids.length < 200) ids.push(bt.id);
      }
      const sums = contained === po.amount;
      await db.insert(reconFindings).values({
        runId,
        kind: sums ? 'payout_sums' : 'payout_differs',
        subjectKey: po.id,
        processorObjectId: po.id,
        processorAmountMinor: po.amount,
        ledgerAmountMinor: contained,
        currency: po.currency.toUpperCase(),
        details: { count, balanceTransactionIds: ids, differenceMinor: po.amount - contained, arrivalDate: po.arrival_date },
      });
      out.push({ id: po.id, amountMinor: po.amount, containedMinor: contained, currency: po.currency.toUpperCase(), count });
    }
    return out;
  }

  /** Money totals per currency from the processor's side of the range. */
  async function totals(runId: string) {
    const res = await db.execute<Record<string, string>>(sql`
      select currency,
        coalesce(sum(amount_minor) filter (where kind = 'charge'), 0)::text as charges,
        coalesce(sum(amount_minor) filter (where kind = 'refund'), 0)::text as refunds,
        coalesce(sum(amount_minor) filter (where kind in ('dispute', 'dispute_reversal')), 0)::text as disputes,
        coalesce(sum(fee_minor), 0)::text as fees,
        coalesce(sum(amount_minor - fee_minor) filter (where kind <> 'payout'), 0)::text as net,
        coalesce(sum(amount_minor) filter (where kind = 'payout'), 0)::text as payouts
      from recon_processor_items where run_id = ${runId} group by currency order by currency
    `);
    return res.rows.map((r) => ({
      currency: r.currency!,
      chargesMinor: Number(r.charges),
      refundsMinor: Number(r.refunds),
      disputesMinor: Number(r.disputes),
      feesMinor: Number(r.fees),
      netMinor: Number(r.net),
      payoutsMinor: Number(r.payouts),
    }));
  }

  async function execute(runId: string, opts: ExecuteOptions = {}): Promise<RunSummary | null> {
    const [run] = await db.select().from(reconRuns).where(eq(reconRuns.id, runId));
    if (!run) throw notFound('books.run_not_found', 'There is no such reconciliation run.');
    // A job handed out again after its run finished (the worker died before telling the queue) has nothing to do.
    if (run.status === 'done' || run.status === 'failed') return run.summary as RunSummary | null;
    const days = daySlices(run.fromAt, run.toAt);
    const total = days.length + 2;
    try {
      // Days fully staged by an earlier attempt are kept; the day it was in is fetched again from its start.
      const resumeAt = Math.min(run.stepsDone, days.length);
      if (resumeAt === 0) await db.delete(reconProcessorItems).where(eq(reconProcessorItems.runId, runId));
      else
        await db
          .delete(reconProcessorItems)
          .where(and(eq(reconProcessorItems.runId, runId), sql`${reconProcessorItems.createdAt} >= ${days[resumeAt]?.from ?? run.toAt}`));
      // Findings are always computed from scratch: a retry replaces what an earlier attempt wrote.
      await db.delete(reconFindings).where(eq(reconFindings.runId, runId));
      const [{ n: staged } = { n: 0 }] = (
        await db.execute<{ n: number }>(sql`select count(*)::int as n from recon_processor_items where run_id = ${runId}`)
      ).rows;
      await db
        .update(reconRuns)
        .set({ status: 'running', error: null, attempts: sql`${reconRuns.attempts} + 1`, stepsTotal: total })
        .where(eq(reconRuns.id, runId));
      let fetched = staged;
      await setProgress(runId, resumeAt, total, `Fetching day ${resumeAt + 1} of ${days.length} from the processor`, fetched);
      for (let i = resumeAt; i < days.length; i++) {
        const day = days[i]!;
        const before = fetched;
        const n = await stage(runId, day.from, day.to, (count) =>
          setProgress(
            runId,
            i,
            total,
            `Fetching day ${i + 1} of ${days.length}: ${before + count} balance transactions so far`,
            before + count,
          ),
        );
        fetched = before + n;
        await setProgress(runId, i + 1, total, `Fetched ${i + 1} of ${days.length} days: ${fetched} balance transactions`, fetched);
      }
      await setProgress(runId, days.length, total, `Matching ${fetched} balance transactions with the ledger`);
      const matched = await match(runId, run.fromAt, run.toAt);
      await setProgress(runId, days.length + 1, total, 'Summing payouts');
      const payoutList = await payouts(runId, run.fromAt, run.toAt);
      const counts = await db.execute<{ kind: string; n: number }>(
        sql`select kind, count(*)::int as n from recon_findings where run_id = ${runId} group by kind`,
      );
      const summary: RunSummary = {
        fetched,
        matched,
        findings: Object.fromEntries(counts.rows.map((r) => [r.kind, r.n])),
        totals: await totals(runId),
        payouts: payoutList,
      };
      await db.delete(reconProcessorItems).where(eq(reconProcessorItems.runId, runId));
      await db
        .update(reconRuns)
        .set({
          status: 'done',
          stepsDone: total,
          stepsTotal: total,
          progress: 100,
          progressLabel: 'Done',
          summary,
          finishedAt: new Date(),
        })
        .where(eq(reconRuns.id, runId));
      return summary;
    } catch (err) {
      const message = (err as Error).message;
      await db
        .update(reconRuns)
        .set(
          opts.finalAttempt
            ? { status: 'failed', error: message, finishedAt: new Date() }
            : { error: message, progressLabel: `Interrupted, will try again: ${message}` },
        )
        .where(eq(reconRuns.id, runId))
        .catch(() => undefined);
      throw err;
    }
  }

  /** The job's retries are used up (its last worker died or failed): the run is marked failed if still open. */
  async function giveUp(runId: string) {
    await db
      .update(reconRuns)
      .set({
        status: 'failed',
        error: sql`coalesce(${reconRuns.error}, 'The run stopped before it finished and its retries are used up.')`,
        finishedAt: new Date(),
      })
      .where(and(eq(reconRuns.id, runId), sql`${reconRuns.status} in ('queued', 'running')`));
  }

  async function findingsOf(runId: string) {
    const rows = await db
      .select({ f: reconFindings, r: reconResolutions })
      .from(reconFindings)
      .leftJoin(
        reconResolutions,
        and(eq(reconResolutions.kind, reconFindings.kind), eq(reconResolutions.subjectKey, reconFindings.subjectKey)),
      )
      .where(eq(reconFindings.runId, runId))
      .orderBy(reconFindings.kind, reconFindings.subjectKey);
    return rows.map(({ f, r }) => ({
      id: f.id,
      kind: f.kind as FindingKind,
      subjectKey: f.subjectKey,
      processorObjectId: f.processorObjectId,
      ledgerEntryId: f.ledgerEntryId,
      pledgeId: f.pledgeId,
      processorAmountMinor: f.processorAmountMinor,
      ledgerAmountMinor: f.ledgerAmountMinor,
      currency: f.currency,
      details: f.details as Record<string, unknown> | null,
      resolution: r ? { action: r.action, note: r.note, at: r.resolvedAt.toISOString() } : null,
    }));
  }

  /** Records a processor object the ledger lacks, through the same functions the webhook uses. */
  async function recordFromProcessor(tx: Tx, balanceTransactionId: string) {
    const bt = await stripe.balanceTransactions.retrieve(balanceTransactionId);
    const kind = ledgerKindOf(bt);
    const sourceId = idOf(bt.source);
    if (!kind || !sourceId) throw conflict('books.cannot_record', `Balance transaction ${bt.id} is not money the ledger records.`);
    const pledgeOf = async (metadata: Stripe.Metadata | null | undefined, piId: string | null) => {
      const fromMeta = metadata?.pledge_id && uuidRe.test(metadata.pledge_id) ? metadata.pledge_id : null;
      const [byMeta] = fromMeta ? await tx.select({ id: pledges.id }).from(pledges).where(eq(pledges.id, fromMeta)) : [];
      if (byMeta) return lockPledge(tx, byMeta.id);
      const [byPi] = piId ? await tx.select({ id: pledges.id }).from(pledges).where(eq(pledges.paymentIntentId, piId)) : [];
      return byPi ? lockPledge(tx, byPi.id) : undefined;
    };
    const plain = (e: {
      kind: 'charge' | 'refund' | 'dispute' | 'dispute_reversal' | 'payout';
      amountMinor: number;
      chargeId?: string | null;
      description: string;
    }) =>
      appendLedgerEntry(tx, {
        kind: e.kind,
        amountMinor: e.amountMinor,
        currency: bt.currency,
        processorObjectId: sourceId,
        processorChargeId: e.chargeId ?? null,
        processorBalanceTransactionId: bt.id,
        description: e.description,
        occurredAt: new Date(bt.created * 1000),
      });
    const plainFee = async (chargeId: string | null) => {
      if (bt.fee > 0)
        await appendLedgerEntry(tx, {
          kind: 'fee',
          amountMinor: -bt.fee,
          currency: bt.currency,
          processorObjectId: bt.id,
          processorChargeId: chargeId,
          processorBalanceTransactionId: bt.id,
          description: 'Processor fee (recorded from the processor)',
          occurredAt: new Date(bt.created * 1000),
        });
    };
    if (kind === 'charge') {
      const facts = await processor.chargeFacts(sourceId);
      const pledge = await pledgeOf(facts.charge.metadata, idOf(facts.charge.payment_intent));
      if (pledge) {
        await recordCharge(tx, pledge, facts);
        await refreshPledgeState(tx, pledge);
      } else {
        await plain({
          kind: 'charge',
          amountMinor: bt.amount,
          chargeId: sourceId,
          description: 'Charge with no pledge (recorded from the processor)',
        });
        await plainFee(sourceId);
      }
    } else if (kind === 'refund') {
      const refund = await stripe.refunds.retrieve(sourceId);
      const charge = await stripe.charges.retrieve(idOf(refund.charge)!);
      const pledge = await pledgeOf(refund.metadata ?? charge.metadata, idOf(charge.payment_intent));
      if (pledge) {
        await recordRefund(tx, pledge, refund);
        await refreshPledgeState(tx, pledge);
      } else
        await plain({ kind: 'refund', amountMinor: bt.amount, chargeId: charge.id, description: 'Refund (recorded from the processor)' });
    } else if (kind === 'dispute' || kind === 'dispute_reversal') {
      const dispute = await stripe.disputes.retrieve(sourceId);
      const charge = await stripe.charges.retrieve(idOf(dispute.charge)!);
      const pledge = await pledgeOf(charge.metadata, idOf(charge.payment_intent));
      if (pledge) {
        await recordDispute(tx, pledge, dispute);
        await refreshPledgeState(tx, pledge);
      } else {
        await plain({
          kind,
          amountMinor: bt.amount,
          chargeId: charge.id,
          description: `${kind === 'dispute' ? 'Dispute' : 'Dispute won'} (recorded from the processor)`,
        });
        await plainFee(charge.id);
      }
    } else {
      await plain({ kind: 'payout', amountMinor: bt.amount, description: 'Payout (recorded from the processor)' });
    }
  }

  return {
    execute,
    giveUp,
    totals,
    findingsOf,
    stage,

    /** Writes the run and its job in one transaction: both or neither. One open run per day at a time. */
    async start(input: StartReconciliationInput, actorId: string | null) {
      const { pool, jobs } = deps;
      if (!pool || !jobs) throw jobsUnavailable();
      const fromAt = new Date(`${input.from}T00:00:00Z`);
      const toAt = new Date(new Date(`${input.to}T00:00:00Z`).getTime() + DAY_MS);
      try {
        return await withTransaction(pool, async (tx, executor) => {
          const [run] = await tx
            .insert(reconRuns)
            .values({ fromAt, toAt, startedBy: actorId, stepsTotal: stepsOf(fromAt, toAt), progressLabel: 'Waiting for a worker' })
            .returning();
          await jobs.send(RECONCILE_QUEUE, { runId: run!.id }, { db: executor, singletonKey: run!.id });
          await recordAudit(tx, {
            actorId,
            action: 'books.reconciliation_started',
            subjectType: 'recon_run',
            subjectId: run!.id,
            before: null,
            after: { from: input.from, to: input.to },
          });
          return run!;
        });
      } catch (err) {
        if (isExclusionViolation(err)) throw runInProgress();
        throw err;
      }
    },

    async list(limit = 50) {
      const rows = await db.select().from(reconRuns).orderBy(desc(reconRuns.createdAt)).limit(limit);
      return rows.map(view);
    },

    async get(runId: string) {
      const [run] = await db.select().from(reconRuns).where(eq(reconRuns.id, runId));
      if (!run) throw notFound('books.run_not_found', 'There is no such reconciliation run.');
      return { run: view(run), findings: run.status === 'done' ? await findingsOf(runId) : [] };
    },

    async resolve(findingId: number, input: ResolveFindingInput, actorId: string) {
      const [finding] = await db.select().from(reconFindings).where(eq(reconFindings.id, findingId));
      if (!finding) throw notFound('books.finding_not_found', 'There is no such finding.');
      if (input.action === 'record_from_processor' && finding.kind !== 'missing_in_ledger')
        throw new AppError(
          400,
          'books.cannot_record',
          'Only a finding "at the processor but not in the ledger" can be recorded from the processor.',
          [{ path: 'action', message: 'use acknowledge for this kind of finding' }],
        );
      await db.transaction(async (tx) => {
        const [existing] = await tx
          .select()
          .from(reconResolutions)
          .where(and(eq(reconResolutions.kind, finding.kind), eq(reconResolutions.subjectKey, finding.subjectKey)));
        if (existing) throw conflict('books.finding_resolved', 'This finding is already resolved.');
        if (input.action === 'record_from_processor') await recordFromProcessor(tx, finding.subjectKey);
        await tx
          .insert(reconResolutions)
          .values({ kind: finding.kind, subjectKey: finding.subjectKey, action: input.action, note: input.note, resolvedBy: actorId });
        await recordAudit(tx, {
          actorId,
          action: 'books.finding_resolved',
          subjectType: 'recon_finding',
          subjectId: String(finding.id),
          before: { kind: finding.kind, subjectKey: finding.subjectKey, runId: finding.runId },
          after: { action: input.action, note: input.note },
        });
      });
    },

    /** Unresolved findings that block closing, for the latest finished run covering [from, to). */
    async coveringRun(from: Date, to: Date) {
      const [run] = await db
        .select()
        .from(reconRuns)
        .where(
          and(
            eq(reconRuns.status, 'done'),
            sql`${reconRuns.fromAt} <= ${from.toISOString()}::timestamptz`,
            sql`${reconRuns.toAt} >= ${to.toISOString()}::timestamptz`,
          ),
        )
        .orderBy(desc(reconRuns.createdAt))
        .limit(1);
      if (!run) return null;
      const open = (await findingsOf(run.id)).filter((f) => blockingFindingKinds.includes(f.kind) && !f.resolution);
      return { run, open };
    },
  };
}

function view(r: typeof reconRuns.$inferSelect) {
  return {
    id: r.id,
    status: r.status,
    from: r.fromAt.toISOString(),
    to: r.toAt.toISOString(),
    progress: r.progress,
    progressLabel: r.progressLabel,
    stepsDone: r.stepsDone,
    stepsTotal: r.stepsTotal,
    fetchedCount: r.fetchedCount,
    attempts: r.attempts,
    summary: r.summary as Record<string, unknown> | null,
    error: r.error,
    createdAt: r.createdAt.toISOString(),
    finishedAt: r.finishedAt?.toISOString() ?? null,
  };
}

export type ReconciliationService = ReturnType<typeof createReconciliationService>;
