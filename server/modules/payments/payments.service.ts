// Applies the processor's webhook events. Each event is applied once (its id goes into processed_events in
// the same transaction as the change) and every handler reconciles from the processor's current objects,
// so duplicates change nothing and events arriving out of order still end in the right state.
import { and, eq, isNull } from 'drizzle-orm';
import type Stripe from 'stripe';
import type { Logger } from 'pino';
import type { Db } from '../../db/client';
import type { Config } from '../../config';
import { MailQueueDataError, queueMail } from '../mail/mail-queue';
import { paymentCustomers, processedEvents, processorEventUnmatched } from './payments.tables';
import { pledges, memberships } from '../pledges/pledges.tables';
import { campaigns, tiers } from '../campaigns/campaigns.tables';
import { accounts, emailPreferences } from '../accounts/accounts.tables';
import { ledgerEntries } from '../ledger/ledger.tables';
import { receipts } from '../books/books.tables';
import { appendLedgerEntry, pledgeIdOfCharge } from '../ledger/ledger.repository';
import {
  lockPledge,
  markAbandoned,
  markFailed,
  recordCharge,
  recordDispute,
  recordRefund,
  refreshPledgeState,
  type ChargeFacts,
  type PledgeRow,
  type Tx,
} from '../pledges/pledge-ledger';
import type { Processor } from './processor';
import type { CampaignsService } from '../campaigns/campaigns.service';

/** Mail written to the outbox inside the event's transaction, after its handler ran (see mail-queue.ts). */
type AfterCommit = (tx: Tx) => Promise<void>;
/** ignored: not ours (or not a kind we act on), acknowledged; unmatched: money not ours, kept for the reconciliation. */
type Outcome = 'applied' | 'duplicate' | 'ignored' | 'unmatched';
type UnmatchedRow = typeof processorEventUnmatched.$inferInsert;

const uuidRe = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;
const idOf = (v: string | { id: string } | null | undefined) => (typeof v === 'string' ? v : (v?.id ?? null));
const asUuid = (v: string | null | undefined) => (v && uuidRe.test(v) ? v : null);
const pledgeIdIn = (metadata: Stripe.Metadata | null | undefined) => asUuid(metadata?.pledge_id);

function subscriptionOfInvoice(invoice: Stripe.Invoice): { subscriptionId: string | null; pledgeId: string | null } {
  const details = invoice.parent?.subscription_details;
  const legacy = (invoice as unknown as { subscription?: string | { id: string } | null }).subscription;
  return { subscriptionId: idOf(details?.subscription ?? legacy ?? null), pledgeId: pledgeIdIn(details?.metadata) };
}

function periodEndOf(sub: Stripe.Subscription): Date | null {
  const fromItem = sub.items?.data?.[0]?.current_period_end;
  const legacy = (sub as unknown as { current_period_end?: number }).current_period_end;
  const end = fromItem ?? legacy;
  return typeof end === 'number' ? new Date(end * 1000) : null;
}

export function createPaymentsService(deps: { db: Db; config: Config; processor: Processor; campaigns: CampaignsService; logger: Logger }) {
  const { db, config, processor } = deps;
  const stripe = processor.stripe;

  async function pledgeIdByColumn(column: 'paymentIntentId' | 'subscriptionId', value: string | null) {
    if (!value) return null;
    const [row] = await db.select({ id: pledges.id }).from(pledges).where(eq(pledges[column], value));
    return row?.id ?? null;
  }

  /**
   * The pledge a charge belongs to, from what we hold and then from the processor: the payment intent's
   * metadata (one-time pledges) or, for a customer of ours, the membership invoice that the charge paid (its
   * invoice event may still be on the way). Null: the charge is not ours.
   */
  async function pledgeOfCharge(charge: Stripe.Charge): Promise<{ pledgeId: string; invoiceId: string | null } | null> {
    const piId = idOf(charge.payment_intent);
    const known = await exists(
      pledgeIdIn(charge.metadata) ?? (await pledgeIdByColumn('paymentIntentId', piId)) ?? (await pledgeIdOfCharge(db, charge.id)),
    );
    if (known) return { pledgeId: known, invoiceId: null };
    if (piId) {
      const pi = await stripe.paymentIntents.retrieve(piId);
      const fromIntent = await exists(pledgeIdIn(pi.metadata));
      if (fromIntent) return { pledgeId: fromIntent, invoiceId: null };
    }
    const customerId = idOf(charge.customer);
    if (!customerId) return null;
    const [ours] = await db.select().from(paymentCustomers).where(eq(paymentCustomers.customerId, customerId));
    if (!ours) return null;
    const invoices = await stripe.invoices
      .list({ customer: customerId, limit: 100, expand: ['data.payments'] })
      .autoPagingToArray({ limit: 1000 });
    for (const invoice of invoices) {
      const paidBy = (invoice.payments?.data ?? []).some(
        (p) => (piId && idOf(p.payment?.payment_intent) === piId) || idOf(p.payment?.charge) === charge.id,
      );
      if (!paidBy) continue;
      const { subscriptionId, pledgeId } = subscriptionOfInvoice(invoice);
      const found = await exists(pledgeId ?? (await pledgeIdByColumn('subscriptionId', subscriptionId)));
      return found ? { pledgeId: found, invoiceId: invoice.id ?? null } : null;
    }
    return null;
  }

  /** What the reconciliation needs of a money event that matches no pledge. */
  function unmatchedRow(event: Stripe.Event, obj: Stripe.Charge | Stripe.Refund | Stripe.Dispute): UnmatchedRow {
    const base = {
      eventId: event.id,
      eventType: event.type,
      objectType: obj.object,
      objectId: obj.id,
      currency: obj.currency ? obj.currency.toUpperCase() : null,
      occurredAt: new Date(event.created * 1000),
    };
    if (obj.object === 'charge')
      return {
        ...base,
        chargeId: obj.id,
        paymentIntentId: idOf(obj.payment_intent),
        customerId: idOf(obj.customer),
        amountMinor: obj.amount_refunded,
      };
    return {
      ...base,
      chargeId: idOf(obj.charge),
      paymentIntentId: idOf(obj.payment_intent),
      customerId: null,
      amountMinor: obj.amount,
    };
  }

  async function exists(pledgeId: string | null) {
    // Another tool's reference (not a uuid) is simply not ours; it must not reach a uuid column.
    if (!pledgeId || !uuidRe.test(pledgeId)) return null;
    const [row] = await db.select({ id: pledges.id }).from(pledges).where(eq(pledges.id, pledgeId));
    return row?.id ?? null;
  }

  async function chargesOfInvoice(invoice: Stripe.Invoice): Promise<ChargeFacts[]> {
    const full = invoice.payments?.data ? invoice : await stripe.invoices.retrieve(invoice.id, { expand: ['payments'] });
    const out: ChargeFacts[] = [];
    for (const p of full.payments?.data ?? []) {
      const piId = idOf(p.payment?.payment_intent);
      const chargeId = idOf(p.payment?.charge);
      const facts = piId
        ? await processor.chargeOfPaymentIntent(piId, invoice.id)
        : chargeId
          ? await processor.chargeFacts(chargeId, invoice.id)
          : null;
      if (facts) out.push(facts);
    }
    return out;
  }

  async function upsertMembership(tx: Tx, pledge: PledgeRow, sub: Stripe.Subscription) {
    const values = {
      status: sub.status,
      currentPeriodEnd: periodEndOf(sub),
      cancelAtPeriodEnd: sub.cancel_at_period_end,
      endedAt: sub.ended_at ? new Date(sub.ended_at * 1000) : null,
      updatedAt: new Date(),
    };
    const [row] = await tx
      .insert(memberships)
      .values({
        pledgeId: pledge.id,
        backerId: pledge.backerId,
        tierId: pledge.tierId,
        subscriptionId: sub.id,
        customerId: idOf(sub.customer as string)!,
        ...values,
      })
      .onConflictDoUpdate({ target: memberships.subscriptionId, set: values })
      .returning();
    if (pledge.subscriptionId !== sub.id) {
      await tx
        .update(pledges)
        .set({ subscriptionId: sub.id, processorCustomerId: idOf(sub.customer), updatedAt: new Date() })
        .where(eq(pledges.id, pledge.id));
    }
    return row!;
  }

  async function wantsMail(tx: Tx, accountId: string, kind: 'receipts' | 'membership') {
    const [prefs] = await tx.select().from(emailPreferences).where(eq(emailPreferences.accountId, accountId));
    return prefs ? prefs[kind] : true;
  }

  function confirmationMail(pledgeId: string): AfterCommit {
    return async (tx) => {
      const [row] = await tx
        .select({ pledge: pledges, account: accounts, campaignTitle: campaigns.title, tierTitle: tiers.title })
        .from(pledges)
        .innerJoin(campaigns, eq(campaigns.id, pledges.campaignId))
        .leftJoin(tiers, eq(tiers.id, pledges.tierId))
        .leftJoin(accounts, eq(accounts.id, pledges.backerId))
        .where(eq(pledges.id, pledgeId));
      if (!row?.account || row.account.deletedAt || !(await wantsMail(tx, row.account.id, 'receipts'))) return;
      const [charge] = await tx
        .select({ id: ledgerEntries.id, amountMinor: ledgerEntries.amountMinor, currency: ledgerEntries.currency })
        .from(ledgerEntries)
        .where(and(eq(ledgerEntries.pledgeId, pledgeId), eq(ledgerEntries.kind, 'charge')))
        .orderBy(ledgerEntries.occurredAt, ledgerEntries.id)
        .limit(1);
      if (!charge) return;
      // The receipt issued with the charge (same transaction) goes with the message as a PDF.
      const [receipt] = await tx
        .select({ id: receipts.id })
        .from(receipts)
        .where(and(eq(receipts.ledgerEntryId, charge.id), isNull(receipts.voidedAt)));
      const renewsMonthly = row.pledge.kind === 'monthly' ? await monthlyRenewal(tx, row.pledge) : null;
      // The pledge's confirmationSentAt claim (pledge-ledger.ts) and this row commit together.
      await queueMail(tx, {
        attachments: receipt ? [{ kind: 'receipt', receiptId: receipt.id }] : [],
        template: 'pledge-confirmation',
        to: row.account.email,
        category: 'transactional',
        accountId: row.account.id,
        idempotencyKey: `pledge-confirmation/${pledgeId}`,
        data: {
          displayName: row.account.displayName,
          campaignTitle: row.campaignTitle,
          ...(row.tierTitle ? { tierTitle: row.tierTitle } : {}),
          amountMinor: charge.amountMinor,
          currency: charge.currency,
          receiptUrl: `${config.PUBLIC_URL}/my-support/receipts/${charge.id}`,
          ...(renewsMonthly ? { renewsMonthly } : {}),
        },
      });
    };
  }

  /**
   * When a monthly pledge renews, for its confirmation. The membership row holds the processor's period end
   * once an invoice event was applied; when the first charge's event came first, the subscription is read
   * from the processor (and recorded), so the date in the mail is always the processor's own.
   */
  async function monthlyRenewal(tx: Tx, pledge: PledgeRow): Promise<{ nextRenewalAt?: Date; manageUrl: string } | null> {
    let [membership] = await tx.select().from(memberships).where(eq(memberships.pledgeId, pledge.id));
    if ((!membership || !membership.currentPeriodEnd) && pledge.subscriptionId) {
      membership = await upsertMembership(tx, pledge, await stripe.subscriptions.retrieve(pledge.subscriptionId));
    }
    const manageUrl = `${config.PUBLIC_URL}/my-support/memberships`;
    return membership?.currentPeriodEnd ? { nextRenewalAt: membership.currentPeriodEnd, manageUrl } : { manageUrl };
  }

  function renewalFailedMail(pledgeId: string, membershipId: string, invoice: Stripe.Invoice): AfterCommit {
    return async (tx) => {
      const [row] = await tx
        .select({ account: accounts, campaignTitle: campaigns.title })
        .from(pledges)
        .innerJoin(campaigns, eq(campaigns.id, pledges.campaignId))
        .leftJoin(accounts, eq(accounts.id, pledges.backerId))
        .where(eq(pledges.id, pledgeId));
      if (!row?.account || row.account.deletedAt || !(await wantsMail(tx, row.account.id, 'membership'))) return;
      await queueMail(tx, {
        template: 'renewal-failed',
        to: row.account.email,
        category: 'transactional',
        accountId: row.account.id,
        idempotencyKey: `renewal-failed/${invoice.id}`,
        data: {
          displayName: row.account.displayName,
          campaignTitle: row.campaignTitle,
          amountMinor: invoice.amount_due,
          currency: invoice.currency.toUpperCase(),
          updateCardUrl: `${config.PUBLIC_URL}/my-support/memberships/${membershipId}/card`,
          ...(invoice.next_payment_attempt ? { nextAttemptAt: new Date(invoice.next_payment_attempt * 1000) } : {}),
        },
      });
    };
  }

  /** Records money facts for a locked pledge and moves its state; the first payment queues the confirmation. */
  async function settle(tx: Tx, pledge: PledgeRow, apply: (p: PledgeRow) => Promise<void>, after: AfterCommit[]) {
    await apply(pledge);
    const { firstPaid } = await refreshPledgeState(tx, pledge);
    if (firstPaid) after.push(confirmationMail(pledge.id));
  }

  type Handler =
    | { pledgeId: string | null; run: (tx: Tx, pledge: PledgeRow | null, after: AfterCommit[]) => Promise<void> }
    | { unmatched: UnmatchedRow };

  /** Works out which pledge the event is about (outside the transaction) and what to do with it (inside). */
  async function route(event: Stripe.Event): Promise<Handler | null> {
    switch (event.type) {
      case 'checkout.session.completed':
      case 'checkout.session.async_payment_succeeded': {
        const s = event.data.object;
        const pledgeId = await exists(pledgeIdIn(s.metadata) ?? asUuid(s.client_reference_id));
        if (!pledgeId) return null;
        return {
          pledgeId,
          run: async (tx, pledge, after) => {
            const session = await stripe.checkout.sessions.retrieve(s.id);
            await tx
              .update(pledges)
              .set({
                checkoutSessionId: session.id,
                checkoutUrl: null,
                paymentIntentId: idOf(session.payment_intent) ?? pledge!.paymentIntentId,
                processorCustomerId: idOf(session.customer) ?? pledge!.processorCustomerId,
                updatedAt: new Date(),
              })
              .where(eq(pledges.id, pledge!.id));
            const current = (await lockPledge(tx, pledge!.id))!;
            await settle(
              tx,
              current,
              async (p) => {
                if (session.mode === 'subscription' && session.subscription) {
                  await upsertMembership(tx, p, await stripe.subscriptions.retrieve(idOf(session.subscription)!));
                  const invoiceId = idOf(session.invoice);
                  if (invoiceId)
                    for (const facts of await chargesOfInvoice(await stripe.invoices.retrieve(invoiceId))) await recordCharge(tx, p, facts);
                } else if (session.payment_intent) {
                  const facts = await processor.chargeOfPaymentIntent(idOf(session.payment_intent)!);
                  if (facts) await recordCharge(tx, p, facts);
                }
              },
              after,
            );
          },
        };
      }

      case 'checkout.session.expired': {
        const s = event.data.object;
        const pledgeId = await exists(pledgeIdIn(s.metadata) ?? asUuid(s.client_reference_id));
        if (!pledgeId) return null;
        return {
          pledgeId,
          run: async (tx, pledge) => {
            await markAbandoned(tx, pledge!, 'The checkout link expired before a payment was made.');
          },
        };
      }

      case 'payment_intent.succeeded': {
        const pi = event.data.object;
        const pledgeId = await exists(pledgeIdIn(pi.metadata) ?? (await pledgeIdByColumn('paymentIntentId', pi.id)));
        // Payments of memberships carry no pledge: their invoice events record them.
        if (!pledgeId) return null;
        return {
          pledgeId,
          run: async (tx, pledge, after) => {
            if (!pledge!.paymentIntentId) await tx.update(pledges).set({ paymentIntentId: pi.id }).where(eq(pledges.id, pledge!.id));
            const facts = await processor.chargeOfPaymentIntent(pi.id);
            await settle(tx, pledge!, async (p) => void (facts && (await recordCharge(tx, p, facts))), after);
          },
        };
      }

      case 'payment_intent.payment_failed': {
        const pi = event.data.object;
        const pledgeId = await exists(pledgeIdIn(pi.metadata) ?? (await pledgeIdByColumn('paymentIntentId', pi.id)));
        if (!pledgeId) return null;
        return {
          pledgeId,
          run: async (tx, pledge) => {
            // A later, successful try of the same checkout may already have landed: then this is history.
            const current = await stripe.paymentIntents.retrieve(pi.id);
            if (current.status === 'succeeded') return;
            const err = pi.last_payment_error;
            if (!pledge!.paymentIntentId) await tx.update(pledges).set({ paymentIntentId: pi.id }).where(eq(pledges.id, pledge!.id));
            await markFailed(tx, pledge!, {
              code: err?.decline_code ?? err?.code ?? 'payment_failed',
              reason: err?.message ?? 'The payment did not go through.',
            });
          },
        };
      }

      case 'charge.refunded':
      case 'charge.refund.updated':
      case 'refund.created':
      case 'refund.updated':
      case 'charge.dispute.created':
      case 'charge.dispute.funds_withdrawn':
      case 'charge.dispute.funds_reinstated':
      case 'charge.dispute.closed': {
        const obj = event.data.object;
        const chargeId = obj.object === 'charge' ? obj.id : idOf(obj.charge);
        if (!chargeId) return null;
        const charge = obj.object === 'charge' ? obj : await stripe.charges.retrieve(chargeId);
        const owner = await pledgeOfCharge(charge);
        if (!owner) return { unmatched: unmatchedRow(event, obj) };
        return {
          pledgeId: owner.pledgeId,
          run: async (tx, pledge, after) => {
            const facts = await processor.chargeFacts(chargeId, owner.invoiceId);
            const refunds = await stripe.refunds.list({ charge: chargeId, limit: 100 }).autoPagingToArray({ limit: 1000 });
            const disputes = event.type.startsWith('charge.dispute')
              ? await stripe.disputes.list({ charge: chargeId, limit: 100 }).autoPagingToArray({ limit: 100 })
              : [];
            await settle(
              tx,
              pledge!,
              async (p) => {
                await recordCharge(tx, p, facts);
                for (const r of refunds) await recordRefund(tx, p, r);
                for (const d of disputes) await recordDispute(tx, p, d);
              },
              after,
            );
          },
        };
      }

      case 'invoice.paid':
      case 'invoice.payment_failed': {
        const invoice = event.data.object;
        const { subscriptionId, pledgeId: fromMeta } = subscriptionOfInvoice(invoice);
        if (!subscriptionId) return null;
        // Our subscriptions carry the pledge id from their checkout on: without it, the invoice is not ours.
        const pledgeId = await exists(fromMeta ?? (await pledgeIdByColumn('subscriptionId', subscriptionId)));
        if (!pledgeId) return null;
        return {
          pledgeId,
          run: async (tx, pledge, after) => {
            const sub = await stripe.subscriptions.retrieve(subscriptionId);
            const membership = await upsertMembership(tx, pledge!, sub);
            if (event.type === 'invoice.paid') {
              const charges = await chargesOfInvoice(invoice);
              await settle(
                tx,
                pledge!,
                async (p) => {
                  for (const facts of charges) await recordCharge(tx, p, facts);
                },
                after,
              );
            } else if (invoice.billing_reason !== 'subscription_create') {
              after.push(renewalFailedMail(pledge!.id, membership.id, invoice));
            }
          },
        };
      }

      case 'customer.subscription.created':
      case 'customer.subscription.updated':
      case 'customer.subscription.deleted':
      case 'customer.subscription.paused':
      case 'customer.subscription.resumed': {
        const sub = event.data.object;
        const pledgeId = await exists(pledgeIdIn(sub.metadata) ?? (await pledgeIdByColumn('subscriptionId', sub.id)));
        if (!pledgeId) return null;
        return {
          pledgeId,
          run: async (tx, pledge) => {
            await upsertMembership(tx, pledge!, await stripe.subscriptions.retrieve(sub.id));
          },
        };
      }

      case 'payout.paid': {
        const payout = event.data.object;
        return {
          pledgeId: null,
          run: async (tx) => {
            await appendLedgerEntry(tx, {
              kind: 'payout',
              amountMinor: -payout.amount,
              currency: payout.currency,
              processorObjectId: payout.id,
              processorBalanceTransactionId: idOf(payout.balance_transaction),
              description: 'Payout to the bank account',
              occurredAt: new Date((payout.arrival_date ?? payout.created) * 1000),
            });
          },
        };
      }

      default:
        return null;
    }
  }

  return {
    async handle(event: Stripe.Event): Promise<Outcome> {
      const [seen] = await db.select({ id: processedEvents.eventId }).from(processedEvents).where(eq(processedEvents.eventId, event.id));
      if (seen) return 'duplicate';
      const handler = await route(event);
      const after: AfterCommit[] = [];
      const fresh = await db.transaction(async (tx) => {
        const claimed = await tx.insert(processedEvents).values({ eventId: event.id, type: event.type }).onConflictDoNothing().returning();
        if (claimed.length === 0) return false;
        if (handler && 'unmatched' in handler) {
          await tx.insert(processorEventUnmatched).values(handler.unmatched).onConflictDoNothing();
        } else if (handler) {
          const pledge = handler.pledgeId ? await lockPledge(tx, handler.pledgeId) : null;
          await handler.run(tx, pledge ?? null, after);
        }
        for (const fn of after) {
          // Data a template refuses is logged, never a reason to refuse the payment fact (nothing was written).
          await fn(tx).catch((err: unknown) => {
            if (!(err instanceof MailQueueDataError)) throw err;
            deps.logger.error({ err, eventId: event.id }, 'mail for a payment event refused by its template');
          });
        }
        return true;
      });
      if (!fresh) return 'duplicate';
      if (!handler) {
        deps.logger.info({ eventId: event.id, type: event.type }, 'processor event not ours or not acted on: acknowledged');
        return 'ignored';
      }
      if ('unmatched' in handler) {
        deps.logger.warn(
          { eventId: event.id, type: event.type, objectId: handler.unmatched.objectId },
          'money event matches no pledge: kept for reconciliation',
        );
        return 'unmatched';
      }
      deps.campaigns.invalidate();
      return 'applied';
    },
  };
}

export type PaymentsService = ReturnType<typeof createPaymentsService>;
