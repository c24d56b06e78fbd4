// Refunds finance starts from a pledge's page. The request row is written (and the pledge row locked) before
// the processor is asked, so two clicks at once cannot together refund more than was paid; the ledger moves
// only when the processor's webhook lands.
import { and, desc, eq, inArray, sql } from 'drizzle-orm';
import type { Logger } from 'pino';
import type { Db } from '../../db/client';
import type { Config } from '../../config';
import { queueMail } from '../mail/mail-queue';
import type { Processor } from '../payments/processor';
import { refundRequests } from './books.tables';
import { ledgerEntries } from '../ledger/ledger.tables';
import { pledges } from '../pledges/pledges.tables';
import { campaigns } from '../campaigns/campaigns.tables';
import { accounts } from '../accounts/accounts.tables';
import { recordAudit } from '../audit/audit.repository';
import { lockPledge, type Tx } from '../pledges/pledge-ledger';
import { AppError, conflict, notFound } from '../../errors';
import { formatMoney } from '../../../shared/money';
import type { CreateRefundInput, RefundReason } from '../../../shared/schemas/books';
import { receipts } from './books.tables';

const processorReason: Record<RefundReason, 'requested_by_customer' | 'duplicate' | 'fraudulent'> = {
  backer_asked: 'requested_by_customer',
  goodwill: 'requested_by_customer',
  duplicate: 'duplicate',
  fraudulent: 'fraudulent',
};
export const refundReasonLabel: Record<RefundReason, string> = {
  backer_asked: 'You asked for it',
  goodwill: 'A goodwill refund from the team',
  duplicate: 'The payment was taken twice',
  fraudulent: 'The payment was not made by the card holder',
};

export function createRefundsService(deps: { db: Db; config: Config; processor: Processor; logger: Logger }) {
  const { db, processor } = deps;

  /** What is still refundable on a charge: paid − refunded in the ledger − requested refunds not yet in it. */
  async function refundable(tx: Pick<Db, 'select'>, chargeId: string) {
    const [charge] = await tx
      .select()
      .from(ledgerEntries)
      .where(and(eq(ledgerEntries.processorObjectId, chargeId), eq(ledgerEntries.kind, 'charge')));
    if (!charge) return null;
    const [booked] = await tx
      .select({ sum: sql<string>`coalesce(-sum(${ledgerEntries.amountMinor}), 0)` })
      .from(ledgerEntries)
      .where(and(eq(ledgerEntries.processorChargeId, chargeId), eq(ledgerEntries.kind, 'refund')));
    const [pending] = await tx
      .select({ sum: sql<string>`coalesce(sum(${refundRequests.amountMinor}), 0)` })
      .from(refundRequests)
      .where(
        and(
          eq(refundRequests.processorChargeId, chargeId),
          inArray(refundRequests.status, ['requested', 'sent']),
          sql`not exists (select 1 from ${ledgerEntries} l where l.processor_object_id = ${refundRequests.processorRefundId} and l.kind = 'refund')`,
        ),
      );
    const refundedMinor = Number(booked?.sum ?? 0);
    const pendingMinor = Number(pending?.sum ?? 0);
    return { charge, refundedMinor, pendingMinor, remainingMinor: charge.amountMinor - refundedMinor - pendingMinor };
  }

  /** Queues the backer's e-mail in the caller's transaction (the outbox): it leaves only if the refund is recorded. */
  async function queueRefundMail(tx: Tx, requestId: string) {
    const [row] = await tx
      .select({
        r: refundRequests,
        accountId: accounts.id,
        email: accounts.email,
        name: accounts.displayName,
        deletedAt: accounts.deletedAt,
        title: campaigns.title,
      })
      .from(refundRequests)
      .innerJoin(pledges, eq(pledges.id, refundRequests.pledgeId))
      .innerJoin(campaigns, eq(campaigns.id, pledges.campaignId))
      .leftJoin(accounts, eq(accounts.id, pledges.backerId))
      .where(eq(refundRequests.id, requestId));
    if (!row?.email || row.deletedAt) return;
    const [charge] = await tx
      .select({ id: ledgerEntries.id })
      .from(ledgerEntries)
      .where(and(eq(ledgerEntries.processorObjectId, row.r.processorChargeId), eq(ledgerEntries.kind, 'charge')));
    await queueMail(tx, {
      template: 'refund-issued',
      to: row.email,
      category: 'transactional',
      accountId: row.accountId,
      idempotencyKey: `refund-issued/${requestId}`,
      data: {
        displayName: row.name ?? 'backer',
        campaignTitle: row.title,
        amountMinor: row.r.amountMinor,
        currency: row.r.currency,
        reason: refundReasonLabel[row.r.reason as RefundReason] ?? row.r.reason,
        receiptUrl: `${deps.config.PUBLIC_URL}/my-support/receipts/${charge?.id ?? ''}`,
      },
    });
  }

  return {
    refundable,

    async create(pledgeId: string, input: CreateRefundInput, actorId: string) {
      const request = await db.transaction(async (tx) => {
        const pledge = await lockPledge(tx, pledgeId);
        if (!pledge) throw notFound('books.pledge_not_found', 'There is no such pledge.');
        let chargeId = input.chargeId;
        if (!chargeId) {
          const [latest] = await tx
            .select({ id: ledgerEntries.processorObjectId })
            .from(ledgerEntries)
            .where(and(eq(ledgerEntries.pledgeId, pledgeId), eq(ledgerEntries.kind, 'charge')))
            .orderBy(desc(ledgerEntries.occurredAt), desc(ledgerEntries.id))
            .limit(1);
          if (!latest) throw conflict('books.nothing_paid', 'This pledge has no payment in the ledger, so there is nothing to refund.');
          chargeId = latest.id;
        }
        const left = await refundable(tx, chargeId);
        if (!left || left.charge.pledgeId !== pledgeId)
          throw notFound('books.charge_not_found', `Payment ${chargeId} is not a payment of this pledge.`);
        if (left.charge.isDemo)
          throw conflict(
            'books.demo_payment',
            'This pledge is demo data: its payment was never made at the processor, so there is nothing there to refund. Refund a pledge paid through the payment page.',
          );
        if (input.amountMinor > left.remainingMinor) {
          const m = (minor: number) => formatMoney(minor, left.charge.currency, 'en-US');
          const room = m(Math.max(0, left.remainingMinor));
          throw new AppError(
            409,
            'books.refund_exceeds_paid',
            `A refund of ${m(input.amountMinor)} would be more than is left of the payment: ${m(left.charge.amountMinor)} paid, ${m(left.refundedMinor)} refunded, ${m(left.pendingMinor)} waiting for the processor, ${room} left.`,
            [{ path: 'amountMinor', message: `must be at most ${room}` }],
          );
        }
        const [row] = await tx
          .insert(refundRequests)
          .values({
            pledgeId,
            processorChargeId: chargeId,
            amountMinor: input.amountMinor,
            currency: left.charge.currency,
            reason: input.reason,
            note: input.note,
            requestedBy: actorId,
          })
          .returning();
        await recordAudit(tx, {
          actorId,
          action: 'books.refund_requested',
          subjectType: 'pledge',
          subjectId: pledgeId,
          after: {
            requestId: row!.id,
            chargeId,
            amountMinor: input.amountMinor,
            currency: left.charge.currency,
            reason: input.reason,
            note: input.note,
          },
        });
        return row!;
      });

      let refundId: string;
      try {
        const refund = await processor.stripe.refunds.create(
          {
            charge: request.processorChargeId,
            amount: request.amountMinor,
            reason: processorReason[request.reason as RefundReason],
            metadata: { pledge_id: pledgeId, refund_request_id: request.id },
          },
          { idempotencyKey: `refund-${request.id}` },
        );
        refundId = refund.id;
      } catch (err) {
        const message = (err as Error).message;
        await db.transaction(async (tx) => {
          await tx.update(refundRequests).set({ status: 'failed', failureMessage: message }).where(eq(refundRequests.id, request.id));
          await recordAudit(tx, {
            actorId,
            action: 'books.refund_failed',
            subjectType: 'pledge',
            subjectId: pledgeId,
            after: { requestId: request.id, message },
          });
        });
        throw new AppError(502, 'books.refund_refused', `The processor did not make the refund: ${message}`);
      }
      return db.transaction(async (tx) => {
        const [sent] = await tx
          .update(refundRequests)
          .set({ status: 'sent', processorRefundId: refundId })
          .where(eq(refundRequests.id, request.id))
          .returning();
        await queueRefundMail(tx, request.id);
        return sent!;
      });
    },

    /** A pledge as finance sees it: its ledger rows, refunds (pending until the ledger has them) and receipts. */
    async pledgeDetail(pledgeId: string) {
      const [row] = await db
        .select({ pledge: pledges, title: campaigns.title, email: accounts.email, name: accounts.displayName })
        .from(pledges)
        .innerJoin(campaigns, eq(campaigns.id, pledges.campaignId))
        .leftJoin(accounts, eq(accounts.id, pledges.backerId))
        .where(eq(pledges.id, pledgeId));
      if (!row) throw notFound('books.pledge_not_found', 'There is no such pledge.');
      const entries = await db
        .select()
        .from(ledgerEntries)
        .where(eq(ledgerEntries.pledgeId, pledgeId))
        .orderBy(ledgerEntries.occurredAt, ledgerEntries.id);
      const requests = await db
        .select()
        .from(refundRequests)
        .where(eq(refundRequests.pledgeId, pledgeId))
        .orderBy(desc(refundRequests.createdAt));
      const receiptRows = await db.select().from(receipts).where(eq(receipts.pledgeId, pledgeId)).orderBy(receipts.number);
      const booked = new Set(entries.filter((e) => e.kind === 'refund').map((e) => e.processorObjectId));
      const charges = [];
      for (const e of entries.filter((x) => x.kind === 'charge')) {
        const left = await refundable(db, e.processorObjectId);
        charges.push({
          chargeId: e.processorObjectId,
          amountMinor: e.amountMinor,
          currency: e.currency,
          refundableMinor: Math.max(0, left?.remainingMinor ?? 0),
          demo: e.isDemo,
        });
      }
      return {
        pledge: {
          id: row.pledge.id,
          state: row.pledge.state,
          kind: row.pledge.kind,
          amountMinor: row.pledge.amountMinor,
          currency: row.pledge.currency,
          campaignTitle: row.title,
          backer: row.email ? { email: row.email, name: row.name } : null,
          paidAt: row.pledge.paidAt?.toISOString() ?? null,
        },
        charges,
        ledger: entries.map((e) => ({
          id: e.id,
          kind: e.kind,
          amountMinor: e.amountMinor,
          currency: e.currency,
          processorObjectId: e.processorObjectId,
          description: e.description,
          occurredAt: e.occurredAt.toISOString(),
          bookedMonth: e.bookedMonth,
        })),
        refunds: requests.map((r) => ({
          id: r.id,
          amountMinor: r.amountMinor,
          currency: r.currency,
          reason: r.reason,
          note: r.note,
          chargeId: r.processorChargeId,
          processorRefundId: r.processorRefundId,
          state: r.status === 'failed' ? 'failed' : r.processorRefundId && booked.has(r.processorRefundId) ? 'booked' : 'pending',
          failureMessage: r.failureMessage,
          createdAt: r.createdAt.toISOString(),
        })),
        receipts: receiptRows.map((r) => ({
          id: r.id,
          number: r.number,
          kind: r.kind,
          amountMinor: r.amountMinor,
          currency: r.currency,
          voided: r.voidedAt !== null,
          issuedAt: r.issuedAt.toISOString(),
        })),
      };
    },
  };
}

export type RefundsService = ReturnType<typeof createRefundsService>;
