import { and, desc, eq, inArray, isNull, or, sql } from 'drizzle-orm';
import Stripe from 'stripe';
import type { Logger } from 'pino';
import type { Db } from '../../db/client';
import type { Config } from '../../config';
import { pledges } from './pledges.tables';
import { campaigns, tiers } from '../campaigns/campaigns.tables';
import { ledgerEntries } from '../ledger/ledger.tables';
import { lockPledge, markAbandoned, type PledgeRow, type Tx } from './pledge-ledger';
import { isMissing, processorUnavailable, type Processor } from '../payments/processor';
import type { CampaignsService } from '../campaigns/campaigns.service';
import { AppError, badRequest, conflict, notFound } from '../../errors';
import { formatMoney } from '../../../shared/money';
import { NO_GIFT_LABEL, type CreatePledgeInput, type PaymentView, type PledgeView } from '../../../shared/schemas/campaign';

type Account = { id: string; email: string; displayName: string };

/** How often a repeated submit looks whether the first one has opened the checkout. */
const CHECKOUT_POLL_MS = 40;

export const pledgeNotFound = () => notFound('pledges.not_found', 'There is no such pledge in your account.');

function isUniqueViolation(err: unknown) {
  const e = err as { code?: string; cause?: { code?: string } };
  return e?.code === '23505' || e?.cause?.code === '23505';
}

export function createPledgesService(deps: { db: Db; config: Config; processor: Processor; campaigns: CampaignsService; logger: Logger }) {
  const { db, config, processor } = deps;
  const stripe = processor.stripe;

  async function views(rows: PledgeRow[]): Promise<PledgeView[]> {
    if (rows.length === 0) return [];
    const ids = rows.map((r) => r.id);
    const campaignRows = await db
      .select({ id: campaigns.id, slug: campaigns.slug, title: campaigns.title })
      .from(campaigns)
      .where(inArray(campaigns.id, [...new Set(rows.map((r) => r.campaignId))]));
    const tierIds = [...new Set(rows.map((r) => r.tierId).filter((t): t is string => Boolean(t)))];
    const tierRows = tierIds.length
      ? await db.select({ id: tiers.id, title: tiers.title }).from(tiers).where(inArray(tiers.id, tierIds))
      : [];
    const totals = await db
      .select({
        pledgeId: ledgerEntries.pledgeId,
        paid: sql<string>`coalesce(sum(${ledgerEntries.amountMinor}) filter (where ${ledgerEntries.kind} = 'charge'), 0)`,
        refunded: sql<string>`coalesce(-sum(${ledgerEntries.amountMinor}) filter (where ${ledgerEntries.kind} in ('refund', 'dispute')), 0)`,
      })
      .from(ledgerEntries)
      .where(inArray(ledgerEntries.pledgeId, ids))
      .groupBy(ledgerEntries.pledgeId);
    return rows.map((r) => {
      const c = campaignRows.find((x) => x.id === r.campaignId)!;
      const t = tierRows.find((x) => x.id === r.tierId);
      const sum = totals.find((x) => x.pledgeId === r.id);
      return {
        id: r.id,
        campaign: { slug: c.slug, title: c.title },
        tier: t ? { id: t.id, title: t.title } : null,
        kind: r.kind,
        amountMinor: r.amountMinor,
        currency: r.currency,
        state: r.state,
        failureReason: r.failureReason,
        declined: r.failureCode !== null,
        publicName: r.publicName,
        message: r.message,
        paidMinor: Number(sum?.paid ?? 0),
        refundedMinor: Number(sum?.refunded ?? 0),
        createdAt: r.createdAt.toISOString(),
        paidAt: r.paidAt?.toISOString() ?? null,
        checkoutUrl: r.state === 'started' || r.state === 'failed' ? r.checkoutUrl : null,
      };
    });
  }

  async function ownPledge(accountId: string, pledgeId: string) {
    const [row] = await db
      .select()
      .from(pledges)
      .where(and(eq(pledges.id, pledgeId), eq(pledges.backerId, accountId)));
    if (!row) throw pledgeNotFound();
    return row;
  }

  async function openCheckout(
    exec: Tx,
    row: PledgeRow,
    account: Account,
    campaign: typeof campaigns.$inferSelect,
    tier: typeof tiers.$inferSelect | undefined,
  ) {
    const metadata = { pledge_id: row.id, campaign_id: campaign.id, ...(tier ? { tier_id: tier.id } : {}) };
    // The processor's page shows this as what is paid for: the campaign and the thank-you gift (or none).
    const description = `${campaign.title} — ${tier ? tier.title : NO_GIFT_LABEL}`;
    const build = async (fresh: { customer?: boolean; product?: boolean }): Promise<Stripe.Checkout.SessionCreateParams> => {
      const customer = await processor.customerFor(account, { fresh: fresh.customer, db: exec });
      const product = await processor.productFor(fresh.product ? { ...campaign, processorProductId: null } : campaign, {
        fresh: fresh.product,
        db: exec,
      });
      const currency = row.currency.toLowerCase();
      let lineItem: Stripe.Checkout.SessionCreateParams.LineItem;
      if (row.kind === 'monthly' && tier && row.amountMinor === tier.minAmountMinor) {
        lineItem = {
          price: await processor.monthlyPriceFor(tier, row.currency, product, { fresh: fresh.product, db: exec }),
          quantity: 1,
        };
      } else {
        lineItem = {
          price_data: {
            currency,
            unit_amount: row.amountMinor,
            product,
            ...(row.kind === 'monthly' ? { recurring: { interval: 'month' as const } } : {}),
          },
          quantity: 1,
        };
      }
      return {
        mode: row.kind === 'monthly' ? 'subscription' : 'payment',
        customer,
        client_reference_id: row.id,
        line_items: [lineItem],
        success_url: `${config.PUBLIC_URL}/pledges/${row.id}/thanks`,
        cancel_url: `${config.PUBLIC_URL}/pledges/${row.id}/cancelled`,
        metadata,
        ...(row.kind === 'monthly' ? { subscription_data: { metadata, description } } : { payment_intent_data: { metadata, description } }),
      };
    };
    // One key per attempt; a second try after a lost customer/product (processor state reset) gets its own.
    const key = `checkout-${row.idempotencyKey}`;
    try {
      return { session: await stripe.checkout.sessions.create(await build({}), { idempotencyKey: key }) };
    } catch (err) {
      if (!isMissing(err)) throw err;
      const fresh = { customer: isMissing(err, 'customer'), product: !isMissing(err, 'customer') };
      return { session: await stripe.checkout.sessions.create(await build(fresh), { idempotencyKey: `${key}-again` }) };
    }
  }

  /**
   * The checkout of a pledge attempt, opened once. Whoever holds the pledge row's lock opens it (the processor
   * call runs inside that transaction, on its one connection, with the attempt's idempotency key); every
   * other submit of the attempt waits, without holding a connection, and then gets the same link. A submit
   * that waited PLEDGE_CHECKOUT_WAIT_MS answers with the pledge and no link yet (202); the pledge's page has the link.
   */
  async function checkoutOf(
    start: PledgeRow,
    account: Account,
    known?: { campaign: typeof campaigns.$inferSelect; tier: typeof tiers.$inferSelect | undefined },
  ): Promise<{ pledge: PledgeView; checkoutUrl: string | null }> {
    const deadline = Date.now() + config.PLEDGE_CHECKOUT_WAIT_MS;
    for (;;) {
      const outcome = await db.transaction(async (tx) => {
        const [locked] = await tx.select().from(pledges).where(eq(pledges.id, start.id)).for('update', { skipLocked: true });
        if (!locked) return { kind: 'busy' as const };
        if (locked.checkoutUrl && (locked.state === 'started' || locked.state === 'failed')) return { kind: 'ready' as const, row: locked };
        if (locked.state !== 'started' || locked.checkoutSessionId) return { kind: 'closed' as const };
        const campaign = known?.campaign ?? (await tx.select().from(campaigns).where(eq(campaigns.id, locked.campaignId)))[0]!;
        const tier = known?.tier ?? (locked.tierId ? (await tx.select().from(tiers).where(eq(tiers.id, locked.tierId)))[0] : undefined);
        let session: Stripe.Checkout.Session;
        try {
          ({ session } = await openCheckout(tx, locked, account, campaign, tier));
        } catch (err) {
          deps.logger.warn({ err, pledgeId: locked.id }, 'checkout session could not be created');
          await markAbandoned(tx, locked, 'The payment processor could not open a checkout.');
          return { kind: 'failed' as const, err };
        }
        const [updated] = await tx
          .update(pledges)
          .set({
            checkoutSessionId: session.id,
            checkoutUrl: session.url,
            processorCustomerId: typeof session.customer === 'string' ? session.customer : null,
            updatedAt: new Date(),
          })
          .where(eq(pledges.id, locked.id))
          .returning();
        return { kind: 'ready' as const, row: updated! };
      });
      if (outcome.kind === 'ready') {
        deps.campaigns.invalidate();
        return { pledge: (await views([outcome.row]))[0]!, checkoutUrl: outcome.row.checkoutUrl };
      }
      if (outcome.kind === 'closed') throw conflict('pledges.attempt_closed', 'This pledge attempt is already closed; start a new one.');
      if (outcome.kind === 'failed') {
        deps.campaigns.invalidate();
        const err = outcome.err;
        if (err instanceof Stripe.errors.StripeError && err.statusCode && err.statusCode < 500 && err.type !== 'StripeConnectionError') {
          throw new AppError(502, 'payments.checkout_refused', `The payment processor refused the checkout: ${err.message}`);
        }
        throw processorUnavailable(err);
      }
      if (Date.now() >= deadline) {
        const [row] = await db.select().from(pledges).where(eq(pledges.id, start.id));
        return { pledge: (await views([row!]))[0]!, checkoutUrl: null };
      }
      await new Promise((r) => setTimeout(r, CHECKOUT_POLL_MS));
    }
  }

  return {
    views,

    async create({
      account,
      input,
    }: {
      account: Account;
      input: CreatePledgeInput;
    }): Promise<{ pledge: PledgeView; checkoutUrl: string | null; replayed: boolean }> {
      const [existing] = await db.select().from(pledges).where(eq(pledges.idempotencyKey, input.attemptKey));
      if (existing) {
        if (existing.backerId !== account.id)
          throw conflict('pledges.attempt_key_taken', 'This attempt key belongs to another pledge; make a new one.');
        // Submitted again, perhaps while the first submit is still opening the checkout: same pledge, same link.
        return { ...(await checkoutOf(existing, account)), replayed: true };
      }

      const [campaign] = await db.select().from(campaigns).where(eq(campaigns.slug, input.campaignSlug));
      if (!campaign) throw notFound('campaigns.not_found', `There is no campaign "${input.campaignSlug}".`);
      const now = Date.now();
      if (now < campaign.startsAt.getTime()) throw conflict('pledges.campaign_not_open', 'This campaign has not opened for pledges yet.');
      if (now >= campaign.endsAt.getTime()) throw conflict('pledges.campaign_ended', 'This campaign has ended and takes no more pledges.');

      let tier: typeof tiers.$inferSelect | undefined;
      if (input.tierId) {
        [tier] = await db
          .select()
          .from(tiers)
          .where(and(eq(tiers.id, input.tierId), eq(tiers.campaignId, campaign.id), eq(tiers.active, true)));
        if (!tier)
          throw badRequest('pledges.tier_unknown', 'This campaign has no such tier.', [
            { path: 'tierId', message: 'is not a tier of this campaign' },
          ]);
        if (input.amountMinor < tier.minAmountMinor) {
          const least = formatMoney(tier.minAmountMinor, campaign.currency, 'en-US');
          throw badRequest('pledges.amount_below_tier', `The ${tier.title} tier starts at ${least}.`, [
            { path: 'amountMinor', message: `must be at least ${least} for this tier` },
          ]);
        }
      }

      let row: PledgeRow;
      try {
        row = await db.transaction(async (tx) => {
          if (tier) {
            // The conditional update is the slot lock: of two pledges for the last slot, one matches no row.
            const taken = await tx
              .update(tiers)
              .set({ soldCount: sql`${tiers.soldCount} + 1` })
              .where(and(eq(tiers.id, tier.id), or(isNull(tiers.quantityLimit), sql`${tiers.soldCount} < ${tiers.quantityLimit}`)))
              .returning({ id: tiers.id });
            if (taken.length === 0) throw conflict('pledges.tier_sold_out', `Every slot of the ${tier.title} tier is taken.`);
          }
          const [inserted] = await tx
            .insert(pledges)
            .values({
              campaignId: campaign.id,
              tierId: tier?.id ?? null,
              backerId: account.id,
              publicName: input.anonymous ? null : input.publicName || account.displayName,
              message: input.message || null,
              kind: tier?.kind ?? 'one-time',
              amountMinor: input.amountMinor,
              currency: campaign.currency,
              slotState: tier ? 'held' : 'none',
              idempotencyKey: input.attemptKey,
            })
            .returning();
          return inserted!;
        });
      } catch (err) {
        if (!isUniqueViolation(err)) throw err;
        // The same attempt submitted twice at once: answer with the one that won.
        return this.create({ account, input });
      }

      const opened = await checkoutOf(row, account, { campaign, tier });
      return { ...opened, replayed: false };
    },

    async get(accountId: string, pledgeId: string) {
      return (await views([await ownPledge(accountId, pledgeId)]))[0]!;
    },

    async listOwn(accountId: string) {
      const rows = await db.select().from(pledges).where(eq(pledges.backerId, accountId)).orderBy(desc(pledges.createdAt));
      return views(rows);
    },

    async paymentsOf(pledgeIds: string[]): Promise<Record<string, PaymentView[]>> {
      if (pledgeIds.length === 0) return {};
      const rows = await db
        .select()
        .from(ledgerEntries)
        .where(and(inArray(ledgerEntries.pledgeId, pledgeIds), inArray(ledgerEntries.kind, ['charge', 'refund', 'dispute'])))
        .orderBy(ledgerEntries.occurredAt, ledgerEntries.id);
      const out: Record<string, PaymentView[]> = {};
      for (const r of rows) {
        (out[r.pledgeId!] ??= []).push({
          id: r.id,
          kind: r.kind as PaymentView['kind'],
          amountMinor: r.amountMinor,
          currency: r.currency,
          occurredAt: r.occurredAt.toISOString(),
          processorId: r.processorObjectId,
        });
      }
      return out;
    },

    /**
     * "Try again" on a pledge that was declined or left: close what is left of the old attempt (its checkout,
     * its held slot), then start a new attempt for the same campaign, gift, amount and public name. The new
     * attempt's key makes a repeated click answer with the same new pledge.
     */
    async retry({ account, pledgeId, attemptKey }: { account: Account; pledgeId: string; attemptKey: string }) {
      const [replay] = await db.select().from(pledges).where(eq(pledges.idempotencyKey, attemptKey));
      const old = await ownPledge(account.id, pledgeId);
      if (!replay && old.state !== 'failed' && old.state !== 'abandoned') {
        throw conflict(
          'pledges.not_retryable',
          old.state === 'started'
            ? 'This pledge is still waiting for its payment; finish paying on its checkout page.'
            : 'This pledge went through; there is nothing to try again.',
        );
      }
      if (!replay && old.state === 'failed') await this.cancel(account.id, old.id);
      const [campaign] = await db.select({ slug: campaigns.slug }).from(campaigns).where(eq(campaigns.id, old.campaignId));
      return this.create({
        account,
        input: {
          campaignSlug: campaign!.slug,
          tierId: old.tierId,
          amountMinor: old.amountMinor,
          anonymous: old.publicName === null,
          ...(old.publicName ? { publicName: old.publicName } : {}),
          ...(old.message ? { message: old.message } : {}),
          attemptKey,
        },
      });
    },

    /** The backer left the checkout: close it at the processor so it cannot be paid later, give the slot back. */
    async cancel(accountId: string, pledgeId: string) {
      const row = await ownPledge(accountId, pledgeId);
      if ((row.state === 'started' || row.state === 'failed') && row.checkoutSessionId) {
        try {
          await stripe.checkout.sessions.expire(row.checkoutSessionId, {}, { idempotencyKey: `expire-${row.checkoutSessionId}` });
        } catch (err) {
          const session = await stripe.checkout.sessions.retrieve(row.checkoutSessionId).catch(() => null);
          if (!session) throw processorUnavailable(err);
          // Paid in the meantime: the webhook records it; nothing to cancel.
          if (session.status === 'complete') return this.get(accountId, pledgeId);
        }
      }
      if (row.state === 'started' || row.state === 'failed') {
        await db.transaction(async (tx) => {
          const locked = await lockPledge(tx, row.id);
          if (locked) await markAbandoned(tx, locked, 'You left the checkout without paying.');
        });
        deps.campaigns.invalidate();
      }
      return this.get(accountId, pledgeId);
    },
  };
}

export type PledgesService = ReturnType<typeof createPledgesService>;
