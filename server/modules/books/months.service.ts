// Month close, its report, the public monthly account, the books dashboard and the CSV exports.
import { desc, eq, sql } from 'drizzle-orm';
import type { Db } from '../../db/client';
import { monthCloses, monthlyAccounts } from './books.tables';
import { campaigns } from '../campaigns/campaigns.tables';
import { recordAudit } from '../audit/audit.repository';
import { AppError, conflict, notFound } from '../../errors';
import type { ReconciliationService } from './reconciliation.service';
import { recordsToCsv } from '../../lib/csv';
import type { CurrencyTotals, MonthReport } from '../../../shared/schemas/books';

export type { CurrencyTotals, MonthReport };

export const monthStart = (month: string) => new Date(`${month}-01T00:00:00Z`);
export const nextMonth = (month: string) => {
  const d = monthStart(month);
  d.setUTCMonth(d.getUTCMonth() + 1);
  return d;
};
const n = (v: unknown) => Number(v ?? 0);

export function createMonthsService(deps: { db: Db; reconciliation: ReconciliationService }) {
  const { db } = deps;

  async function computeReport(month: string, campaignId?: string): Promise<MonthReport> {
    const day = `${month}-01`;
    const scope = campaignId ? sql`and l.campaign_id = ${campaignId}` : sql``;
    const totals = await db.execute<Record<string, unknown>>(sql`
      select l.currency,
        coalesce(sum(l.amount_minor) filter (where l.kind = 'charge'), 0) as charges,
        coalesce(-sum(l.amount_minor) filter (where l.kind = 'fee'), 0) as fees,
        coalesce(-sum(l.amount_minor) filter (where l.kind = 'refund'), 0) as refunds,
        coalesce(-sum(l.amount_minor) filter (where l.kind = 'dispute'), 0) as disputes,
        coalesce(sum(l.amount_minor) filter (where l.kind = 'dispute_reversal'), 0) as reversals,
        coalesce(-sum(l.amount_minor) filter (where l.kind = 'payout'), 0) as payouts,
        coalesce(sum(l.amount_minor) filter (where l.kind <> 'payout'), 0) as net
      from ledger_entries l where l.booked_month = ${day}::date ${scope}
      group by l.currency order by l.currency`);
    const byTier = await db.execute<Record<string, unknown>>(sql`
      select coalesce(c.title, '(no campaign)') as campaign_title, coalesce(t.title, '(no tier)') as tier_title, l.currency,
             count(*)::int as n, sum(l.amount_minor) as amount
      from ledger_entries l
      left join pledges p on p.id = l.pledge_id
      left join tiers t on t.id = p.tier_id
      left join campaigns c on c.id = l.campaign_id
      where l.booked_month = ${day}::date and l.kind = 'charge' ${scope}
      group by 1, 2, 3 order by 1, 2, 3`);
    const late = await db.execute<Record<string, unknown>>(sql`
      select l.id, l.kind::text as kind, l.amount_minor, l.currency, to_char(l.occurred_at at time zone 'UTC', 'YYYY-MM') as occurred_month,
             l.processor_charge_id
      from ledger_entries l
      where l.booked_month = ${day}::date and date_trunc('month', l.occurred_at at time zone 'UTC')::date <> l.booked_month ${scope}
      order by l.id`);
    const payouts = await db.execute<Record<string, unknown>>(sql`
      select processor_object_id, -amount_minor as amount, currency, occurred_at from ledger_entries l
      where l.booked_month = ${day}::date and l.kind = 'payout' ${scope} order by occurred_at, id`);
    return {
      month,
      totals: totals.rows.map((r) => ({
        currency: String(r.currency),
        chargesMinor: n(r.charges),
        feesMinor: n(r.fees),
        refundsMinor: n(r.refunds),
        disputesMinor: n(r.disputes),
        disputeReversalsMinor: n(r.reversals),
        payoutsMinor: n(r.payouts),
        netMinor: n(r.net),
      })),
      byTier: byTier.rows.map((r) => ({
        campaignTitle: String(r.campaign_title),
        tierTitle: String(r.tier_title),
        currency: String(r.currency),
        count: n(r.n),
        amountMinor: n(r.amount),
      })),
      lateEntries: late.rows.map((r) => ({
        entryId: n(r.id),
        kind: String(r.kind),
        amountMinor: n(r.amount_minor),
        currency: String(r.currency),
        occurredMonth: String(r.occurred_month),
        processorChargeId: (r.processor_charge_id as string | null) ?? null,
      })),
      payouts: payouts.rows.map((r) => ({
        processorObjectId: String(r.processor_object_id),
        amountMinor: n(r.amount),
        currency: String(r.currency),
        occurredAt: new Date(r.occurred_at as string).toISOString(),
      })),
    };
  }

  async function closed(month: string) {
    const [row] = await db
      .select()
      .from(monthCloses)
      .where(eq(monthCloses.month, `${month}-01`));
    return row ?? null;
  }

  return {
    computeReport,

    async report(month: string) {
      const row = await closed(month);
      return {
        month,
        closed: row ? { at: row.closedAt.toISOString(), runId: row.runId } : null,
        report: row ? (row.report as MonthReport) : await computeReport(month),
      };
    },

    async list() {
      const res = await db.execute<{ month: string }>(sql`
        select to_char(m, 'YYYY-MM') as month from (
          select distinct booked_month as m from ledger_entries
          union select month from month_closes
          union select date_trunc('month', now() at time zone 'UTC')::date
          -- the month just ended is the one finance closes next, also when no money moved in it
          union select (date_trunc('month', now() at time zone 'UTC') - interval '1 month')::date
        ) x order by m desc limit 36`);
      const closes = await db.select().from(monthCloses);
      const published = await db.select({ month: monthlyAccounts.month }).from(monthlyAccounts);
      return res.rows.map((r) => {
        const c = closes.find((x) => x.month === `${r.month}-01`);
        return {
          month: r.month,
          closedAt: c?.closedAt.toISOString() ?? null,
          published: published.some((p) => p.month === `${r.month}-01`),
        };
      });
    },

    async close(month: string, actorId: string) {
      const from = monthStart(month);
      const to = nextMonth(month);
      if (from.getTime() > Date.now())
        throw new AppError(400, 'books.month_in_future', `${month} has not begun; only a begun month can be closed.`);
      if (await closed(month)) throw conflict('books.month_closed', `${month} is already closed.`);
      const covering = await deps.reconciliation.coveringRun(from, to);
      if (!covering)
        throw conflict(
          'books.not_reconciled',
          `Run a reconciliation covering all of ${month} (from ${month}-01 to its last day) before closing it.`,
        );
      if (covering.open.length > 0)
        throw conflict(
          'books.findings_open',
          `The latest reconciliation of ${month} has ${covering.open.length} unresolved finding(s); resolve them first.`,
        );
      return db.transaction(async (tx) => {
        // Serialise closes: a concurrent close of the same month waits, then sees it closed.
        await tx.execute(sql`select pg_advisory_xact_lock(hashtext('books.month_close'))`);
        const [again] = await tx
          .select()
          .from(monthCloses)
          .where(eq(monthCloses.month, `${month}-01`));
        if (again) throw conflict('books.month_closed', `${month} is already closed.`);
        const report = await computeReport(month);
        const [row] = await tx
          .insert(monthCloses)
          .values({ month: `${month}-01`, closedBy: actorId, runId: covering.run.id, report })
          .returning();
        await recordAudit(tx, {
          actorId,
          action: 'books.month_closed',
          subjectType: 'month',
          subjectId: month,
          after: { runId: covering.run.id, totals: report.totals },
        });
        return { month, closedAt: row!.closedAt.toISOString(), report };
      });
    },

    async publish(month: string, campaignSlug: string, actorId: string) {
      if (!(await closed(month))) throw conflict('books.month_open', `Close ${month} before publishing its account.`);
      const [campaign] = await db.select().from(campaigns).where(eq(campaigns.slug, campaignSlug));
      if (!campaign) throw notFound('campaigns.not_found', 'There is no such campaign.');
      const report = await computeReport(month, campaign.id);
      const t = report.totals.find((x) => x.currency === campaign.currency) ?? report.totals[0];
      const [backers] = await db
        .execute<{ n: number }>(
          sql`
        select count(distinct coalesce(p.backer_id::text, p.id::text))::int as n
        from ledger_entries l join pledges p on p.id = l.pledge_id
        where l.booked_month = ${`${month}-01`}::date and l.kind = 'charge' and l.campaign_id = ${campaign.id}`,
        )
        .then((r) => r.rows);
      const values = {
        currency: t?.currency ?? campaign.currency,
        raisedMinor: t?.chargesMinor ?? 0,
        feesMinor: t?.feesMinor ?? 0,
        refundsMinor: t?.refundsMinor ?? 0,
        disputesMinor: (t?.disputesMinor ?? 0) - (t?.disputeReversalsMinor ?? 0),
        netMinor: t?.netMinor ?? 0,
        backerCount: backers?.n ?? 0,
      };
      await db.transaction(async (tx) => {
        await tx
          .insert(monthlyAccounts)
          .values({ campaignId: campaign.id, month: `${month}-01`, publishedBy: actorId, ...values })
          .onConflictDoUpdate({
            target: [monthlyAccounts.campaignId, monthlyAccounts.month],
            set: { ...values, publishedAt: new Date(), publishedBy: actorId },
          });
        await recordAudit(tx, {
          actorId,
          action: 'books.account_published',
          subjectType: 'month',
          subjectId: month,
          after: { campaign: campaignSlug, ...values },
        });
      });
      return { month, ...values };
    },

    async publicAccounts(campaignSlug: string) {
      const [campaign] = await db.select().from(campaigns).where(eq(campaigns.slug, campaignSlug));
      if (!campaign) throw notFound('campaigns.not_found', 'There is no such campaign.');
      const rows = await db
        .select()
        .from(monthlyAccounts)
        .where(eq(monthlyAccounts.campaignId, campaign.id))
        .orderBy(desc(monthlyAccounts.month));
      return rows.map((r) => ({
        month: r.month.slice(0, 7),
        currency: r.currency,
        raisedMinor: r.raisedMinor,
        feesMinor: r.feesMinor,
        refundsMinor: r.refundsMinor,
        disputesMinor: r.disputesMinor,
        netMinor: r.netMinor,
        backerCount: r.backerCount,
        publishedAt: r.publishedAt.toISOString(),
      }));
    },

    reportCsv(report: MonthReport) {
      const rows: Record<string, unknown>[] = [];
      for (const t of report.totals)
        for (const [k, v] of Object.entries(t))
          if (k !== 'currency') rows.push({ section: 'totals', item: k, currency: t.currency, count: '', amount_minor: v });
      for (const t of report.byTier)
        rows.push({
          section: 'by tier',
          item: `${t.campaignTitle} / ${t.tierTitle}`,
          currency: t.currency,
          count: t.count,
          amount_minor: t.amountMinor,
        });
      for (const p of report.payouts)
        rows.push({ section: 'payouts', item: p.processorObjectId, currency: p.currency, count: '', amount_minor: p.amountMinor });
      for (const l of report.lateEntries)
        rows.push({
          section: `late from ${l.occurredMonth}`,
          item: `${l.kind} #${l.entryId} of ${l.processorChargeId ?? ''}`,
          currency: l.currency,
          count: '',
          amount_minor: l.amountMinor,
        });
      return recordsToCsv(rows, ['section', 'item', 'currency', 'count', 'amount_minor']);
    },

    async dashboard() {
      const months = await db.execute<Record<string, unknown>>(sql`
        select to_char(booked_month, 'YYYY-MM') as month, currency,
          coalesce(sum(amount_minor) filter (where kind = 'charge'), 0) as charges,
          coalesce(-sum(amount_minor) filter (where kind = 'fee'), 0) as fees,
          coalesce(-sum(amount_minor) filter (where kind = 'refund'), 0) as refunds,
          coalesce(sum(amount_minor) filter (where kind <> 'payout'), 0) as net
        from ledger_entries where booked_month >= (date_trunc('month', now()) - interval '11 months')::date
        group by 1, 2 order by 1, 2`);
      const days = await db.execute<Record<string, unknown>>(sql`
        select to_char(date_trunc('day', paid_at at time zone 'UTC'), 'YYYY-MM-DD') as day, count(*)::int as n, sum(amount_minor) as amount, currency
        from pledges where paid_at is not null and paid_at >= now() - interval '90 days'
        group by 1, currency order by 1`);
      const tiersRes = await db.execute<Record<string, unknown>>(sql`
        select coalesce(t.title, '(no tier)') as tier, l.currency, count(*)::int as n, sum(l.amount_minor) as amount
        from ledger_entries l left join pledges p on p.id = l.pledge_id left join tiers t on t.id = p.tier_id
        where l.kind = 'charge' group by 1, 2 order by amount desc`);
      const mrr = await db.execute<Record<string, unknown>>(sql`
        select p.currency, sum(p.amount_minor) as amount, count(*)::int as n
        from memberships m join pledges p on p.id = m.pledge_id
        where m.status in ('active', 'past_due') group by p.currency`);
      const [churn] = await db
        .execute<Record<string, unknown>>(
          sql`
        select count(*) filter (where ended_at >= now() - interval '30 days')::int as ended,
               count(*) filter (where created_at < now() - interval '30 days' and (ended_at is null or ended_at >= now() - interval '30 days'))::int as at_start
        from memberships`,
        )
        .then((r) => r.rows);
      const [retry] = await db
        .execute<Record<string, unknown>>(sql`select count(*)::int as n from memberships where status = 'past_due'`)
        .then((r) => r.rows);
      return {
        months: months.rows.map((r) => ({
          month: String(r.month),
          currency: String(r.currency),
          chargesMinor: n(r.charges),
          feesMinor: n(r.fees),
          refundsMinor: n(r.refunds),
          netMinor: n(r.net),
        })),
        pledgesByDay: days.rows.map((r) => ({ day: String(r.day), count: n(r.n), amountMinor: n(r.amount), currency: String(r.currency) })),
        byTier: tiersRes.rows.map((r) => ({ tier: String(r.tier), currency: String(r.currency), count: n(r.n), amountMinor: n(r.amount) })),
        monthlyRecurring: mrr.rows.map((r) => ({ currency: String(r.currency), amountMinor: n(r.amount), members: n(r.n) })),
        churn: {
          endedLast30Days: n(churn?.ended),
          atStart: n(churn?.at_start),
          rate: n(churn?.at_start) > 0 ? n(churn?.ended) / n(churn?.at_start) : 0,
        },
        failedRenewalsAwaitingRetry: n(retry?.n),
      };
    },

    async exportCsv(kind: 'pledges' | 'backers' | 'ledger' | 'findings', runId?: string) {
      if (kind === 'ledger') {
        const r = await db.execute<Record<string, unknown>>(sql`
          select id, kind, amount_minor, currency, booked_month, occurred_at, processor_object_id, processor_charge_id, pledge_id, description
          from ledger_entries order by id`);
        return recordsToCsv(r.rows, [
          'id',
          'kind',
          'amount_minor',
          'currency',
          'booked_month',
          'occurred_at',
          'processor_object_id',
          'processor_charge_id',
          'pledge_id',
          'description',
        ]);
      }
      if (kind === 'pledges') {
        const r = await db.execute<Record<string, unknown>>(sql`
          select p.id, c.slug as campaign, t.title as tier, p.kind, p.state, p.amount_minor, p.currency, p.public_name, p.message, p.paid_at, p.created_at
          from pledges p join campaigns c on c.id = p.campaign_id left join tiers t on t.id = p.tier_id order by p.created_at`);
        return recordsToCsv(r.rows, [
          'id',
          'campaign',
          'tier',
          'kind',
          'state',
          'amount_minor',
          'currency',
          'public_name',
          'message',
          'paid_at',
          'created_at',
        ]);
      }
      if (kind === 'backers') {
        const r = await db.execute<Record<string, unknown>>(sql`
          select a.id, a.display_name, a.email, count(p.id)::int as pledges, coalesce(sum(l.amount_minor), 0) as paid_minor, min(l.currency) as currency
          from accounts a join pledges p on p.backer_id = a.id
          left join ledger_entries l on l.pledge_id = p.id and l.kind = 'charge'
          where a.deleted_at is null group by a.id order by a.display_name`);
        return recordsToCsv(r.rows, ['id', 'display_name', 'email', 'pledges', 'paid_minor', 'currency']);
      }
      const r = await db.execute<Record<string, unknown>>(sql`
        select f.run_id, f.kind, f.subject_key, f.processor_object_id, f.ledger_entry_id, f.processor_amount_minor, f.ledger_amount_minor,
               f.currency, rr.action as resolution, rr.note as resolution_note
        from recon_findings f left join recon_resolutions rr on rr.kind = f.kind and rr.subject_key = f.subject_key
        where ${runId ? sql`f.run_id = ${runId}` : sql`f.run_id = (select id from recon_runs where status = 'done' order by created_at desc limit 1)`}
        order by f.kind, f.subject_key`);
      return recordsToCsv(r.rows, [
        'run_id',
        'kind',
        'subject_key',
        'processor_object_id',
        'ledger_entry_id',
        'processor_amount_minor',
        'ledger_amount_minor',
        'currency',
        'resolution',
        'resolution_note',
      ]);
    },
  };
}

export type MonthsService = ReturnType<typeof createMonthsService>;
