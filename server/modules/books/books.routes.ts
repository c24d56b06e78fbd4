import { Router, type Response } from 'express';
import { z } from 'zod';
import type { Logger } from 'pino';
import { desc, eq, ilike, or, sql } from 'drizzle-orm';
import type pg from 'pg';
import type { Db } from '../../db/client';
import type { JobSender } from '../../jobs/queue';
import type { Config } from '../../config';
import { processorUnavailable, type Processor } from '../payments/processor';
import { validated } from '../../middleware/validate';
import { requireAuth, requireRole } from '../../middleware/auth';
import {
  booksSettingsSchema,
  createRefundSchema,
  monthParamSchema,
  resolveFindingSchema,
  startReconciliationSchema,
} from '../../../shared/schemas/books';
import { createRefundsService } from './refunds.service';
import { createReconciliationService } from './reconciliation.service';
import { createMonthsService } from './months.service';
import { createReceiptsService } from './receipts.service';
import { renderReportPdf } from './pdf';
import { pledges } from '../pledges/pledges.tables';
import { campaigns } from '../campaigns/campaigns.tables';
import { accounts } from '../accounts/accounts.tables';
import { formatMoney } from '../../../shared/money';

const idParams = z.object({ id: z.uuid({ message: 'must be an id' }) });
const findingParams = z.object({ id: z.coerce.number().int().positive({ message: 'must be a finding number' }) });

function sendFile(res: Response, body: Buffer | string, type: string, filename: string) {
  res.setHeader('content-type', type);
  res.setHeader('content-disposition', `attachment; filename="${filename}"`);
  res.setHeader('cache-control', 'private, no-store');
  res.send(body);
}

export function createBooks(deps: { db: Db; pool: pg.Pool; config: Config; processor: Processor; logger: Logger; jobs?: JobSender }) {
  const { db } = deps;
  const refunds = createRefundsService(deps);
  const reconciliation = createReconciliationService(deps);
  const months = createMonthsService({ db, reconciliation });
  const receiptsService = createReceiptsService({ db });
  const finance = requireRole('finance', 'admin');

  const router = Router();
  router.use(finance);

  router.get('/dashboard', async (_req, res) => {
    res.json(await months.dashboard());
  });

  router.get(
    '/pledges',
    validated({ query: z.object({ q: z.string().trim().max(200).default('') }) }, async (_req, res, { query }) => {
      const like = `%${query.q}%`;
      const rows = await db
        .select({ p: pledges, title: campaigns.title, email: accounts.email, name: accounts.displayName })
        .from(pledges)
        .innerJoin(campaigns, eq(campaigns.id, pledges.campaignId))
        .leftJoin(accounts, eq(accounts.id, pledges.backerId))
        .where(
          query.q
            ? or(
                ilike(accounts.email, like),
                ilike(accounts.displayName, like),
                sql`${pledges.id}::text = ${query.q}`,
                ilike(pledges.paymentIntentId, like),
              )
            : sql`${pledges.state} <> 'started'`,
        )
        .orderBy(desc(pledges.createdAt))
        .limit(100);
      res.json({
        pledges: rows.map((r) => ({
          id: r.p.id,
          state: r.p.state,
          kind: r.p.kind,
          amountMinor: r.p.amountMinor,
          currency: r.p.currency,
          campaignTitle: r.title,
          backer: r.email ? { email: r.email, name: r.name } : null,
          createdAt: r.p.createdAt.toISOString(),
        })),
      });
    }),
  );
  router.get(
    '/pledges/:id',
    validated({ params: idParams }, async (_req, res, { params }) => {
      res.json(await refunds.pledgeDetail(params.id));
    }),
  );
  router.post(
    '/pledges/:id/refunds',
    validated({ params: idParams, body: createRefundSchema }, async (req, res, { params, body }) => {
      const refund = await refunds.create(params.id, body, req.user!.id);
      res.status(201).json({
        refund: { id: refund.id, status: refund.status, processorRefundId: refund.processorRefundId, amountMinor: refund.amountMinor },
      });
    }),
  );

  router.get('/disputes', async (_req, res) => {
    const list = await deps.processor.stripe.disputes
      .list({ limit: 100 })
      .autoPagingToArray({ limit: 1000 })
      .catch((err: unknown) => {
        throw processorUnavailable(err);
      });
    const chargeIds = list.map((d) => (typeof d.charge === 'string' ? d.charge : d.charge.id));
    const linked = chargeIds.length
      ? await db.execute<{ charge: string; pledge_id: string }>(
          sql`select processor_object_id as charge, pledge_id from ledger_entries where kind = 'charge' and processor_object_id in ${chargeIds}`,
        )
      : { rows: [] };
    const disputes = list
      .map((d) => ({
        id: d.id,
        status: d.status,
        amountMinor: d.amount,
        currency: d.currency.toUpperCase(),
        reason: d.reason,
        chargeId: typeof d.charge === 'string' ? d.charge : d.charge.id,
        pledgeId: linked.rows.find((r) => r.charge === (typeof d.charge === 'string' ? d.charge : d.charge.id))?.pledge_id ?? null,
        respondBy: d.evidence_details?.due_by ? new Date(d.evidence_details.due_by * 1000).toISOString() : null,
        createdAt: new Date(d.created * 1000).toISOString(),
      }))
      .sort((a, b) => (b.respondBy ?? '').localeCompare(a.respondBy ?? ''));
    res.json({ disputes });
  });

  router.get('/reconciliations', async (_req, res) => {
    res.json({ runs: await reconciliation.list() });
  });
  router.post(
    '/reconciliations',
    validated({ body: startReconciliationSchema }, async (req, res, { body }) => {
      // The run and its job are written together; a worker does the work and stores its progress on the run.
      const run = await reconciliation.start(body, req.user!.id);
      res.status(202).json(await reconciliation.get(run.id));
    }),
  );
  router.get(
    '/reconciliations/:id',
    validated({ params: idParams }, async (_req, res, { params }) => {
      res.json(await reconciliation.get(params.id));
    }),
  );
  router.post(
    '/findings/:id/resolve',
    validated({ params: findingParams, body: resolveFindingSchema }, async (req, res, { params, body }) => {
      await reconciliation.resolve(params.id, body, req.user!.id);
      res.json({ ok: true });
    }),
  );

  router.get('/months', async (_req, res) => {
    res.json({ months: await months.list() });
  });
  router.get(
    '/months/:month',
    validated({ params: monthParamSchema }, async (_req, res, { params }) => {
      res.json(await months.report(params.month));
    }),
  );
  router.get(
    '/months/:month/report.csv',
    validated({ params: monthParamSchema }, async (_req, res, { params }) => {
      const { report } = await months.report(params.month);
      sendFile(res, months.reportCsv(report), 'text/csv; charset=utf-8', `close-report-${params.month}.csv`);
    }),
  );
  router.get(
    '/months/:month/report.pdf',
    validated({ params: monthParamSchema }, async (_req, res, { params }) => {
      const { report, closed } = await months.report(params.month);
      const money = (m: number, c: string) => formatMoney(m, c);
      const pdf = await renderReportPdf({
        title: `Month report ${params.month}${closed ? ' (closed)' : ' (open)'}`,
        org: await receiptsService.settings(),
        sections: [
          ...report.totals.map((t) => ({
            heading: `Totals ${t.currency}`,
            rows: [
              ['Charges', money(t.chargesMinor, t.currency)],
              ['Processor fees', money(t.feesMinor, t.currency)],
              ['Refunds', money(t.refundsMinor, t.currency)],
              ['Disputes', money(t.disputesMinor, t.currency)],
              ['Disputes won back', money(t.disputeReversalsMinor, t.currency)],
              ['Net', money(t.netMinor, t.currency)],
              ['Payouts', money(t.payoutsMinor, t.currency)],
            ] as [string, string][],
          })),
          {
            heading: 'By tier',
            rows: report.byTier.map((t) => [`${t.tierTitle} (${t.count})`, money(t.amountMinor, t.currency)] as [string, string]),
          },
          {
            heading: 'Payouts',
            rows: report.payouts.map((p) => [p.processorObjectId, money(p.amountMinor, p.currency)] as [string, string]),
          },
          {
            heading: 'Booked here from closed months',
            rows: report.lateEntries.map(
              (l) =>
                [`${l.kind} of ${l.processorChargeId ?? '—'} (${l.occurredMonth})`, money(l.amountMinor, l.currency)] as [string, string],
            ),
          },
        ],
      });
      sendFile(res, pdf, 'application/pdf', `close-report-${params.month}.pdf`);
    }),
  );
  router.post(
    '/months/:month/close',
    validated({ params: monthParamSchema }, async (req, res, { params }) => {
      res.json(await months.close(params.month, req.user!.id));
    }),
  );
  router.post(
    '/months/:month/publish',
    validated(
      { params: monthParamSchema, body: z.object({ campaignSlug: z.string().trim().min(1, { message: 'is required' }) }) },
      async (req, res, { params, body }) => {
        res.json({ account: await months.publish(params.month, body.campaignSlug, req.user!.id) });
      },
    ),
  );

  router.get(
    '/exports/:kind.csv',
    validated(
      { params: z.object({ kind: z.enum(['pledges', 'backers', 'ledger', 'findings']) }), query: z.object({ runId: z.uuid().optional() }) },
      async (_req, res, { params, query }) => {
        sendFile(res, await months.exportCsv(params.kind, query.runId), 'text/csv; charset=utf-8', `${params.kind}.csv`);
      },
    ),
  );

  router.get('/settings', async (_req, res) => {
    res.json({ settings: await receiptsService.settings() });
  });
  router.put(
    '/settings',
    validated({ body: booksSettingsSchema }, async (req, res, { body }) => {
      res.json({ settings: await receiptsService.saveSettings(body, req.user!.id) });
    }),
  );
  router.get(
    '/receipts/:id.pdf',
    validated({ params: idParams }, async (req, res, { params }) => {
      const { pdf, filename } = await receiptsService.receiptPdf(params.id, req.user!);
      sendFile(res, pdf, 'application/pdf', filename);
    }),
  );

  // The backer's own receipts (my support).
  const receiptsRouter = Router();
  receiptsRouter.use(requireAuth);
  receiptsRouter.get('/', async (req, res) => {
    res.json({ receipts: await receiptsService.listOwn(req.user!.id) });
  });
  receiptsRouter.get(
    '/yearly/:year.pdf',
    validated({ params: z.object({ year: z.coerce.number().int().min(2000).max(2100) }) }, async (req, res, { params }) => {
      const { pdf, filename } = await receiptsService.yearlyPdf(req.user!.id, params.year);
      sendFile(res, pdf, 'application/pdf', filename);
    }),
  );
  receiptsRouter.get(
    '/by-payment/:entryId.pdf',
    validated(
      { params: z.object({ entryId: z.coerce.number().int().positive({ message: 'must be a payment number' }) }) },
      async (req, res, { params }) => {
        const current = await receiptsService.currentForEntry(params.entryId, req.user!);
        const { pdf, filename } = await receiptsService.receiptPdf(current.id, req.user!);
        sendFile(res, pdf, 'application/pdf', filename);
      },
    ),
  );
  receiptsRouter.get(
    '/:id.pdf',
    validated({ params: idParams }, async (req, res, { params }) => {
      const { pdf, filename } = await receiptsService.receiptPdf(params.id, req.user!);
      sendFile(res, pdf, 'application/pdf', filename);
    }),
  );

  const publicRouter = Router();
  publicRouter.get(
    '/:slug',
    validated({ params: z.object({ slug: z.string().min(1).max(100) }) }, async (_req, res, { params }) => {
      res.json({ accounts: await months.publicAccounts(params.slug) });
    }),
  );

  return { router, receiptsRouter, publicRouter, services: { refunds, reconciliation, months, receipts: receiptsService } };
}
