// The processor objects Lightkeel keeps ids of (customer, product, price), made on first use through the SDK
// with idempotency keys, and the look-ups the webhook handler reconciles from.
import { and, eq, isNull } from 'drizzle-orm';
import Stripe from 'stripe';
import type { Db } from '../../db/client';
import { paymentCustomers } from './payments.tables';
import { campaigns, tiers } from '../campaigns/campaigns.tables';
import type { ChargeFacts } from '../pledges/pledge-ledger';
import { AppError } from '../../errors';

export const processorUnavailable = (err: unknown) =>
  new AppError(
    502,
    'payments.processor_unavailable',
    `The payment processor did not answer as expected; nothing was charged. Try again in a moment. (${(err as Error).message})`,
  );

export const isMissing = (err: unknown, param?: string) =>
  err instanceof Stripe.errors.StripeInvalidRequestError &&
  err.code === 'resource_missing' &&
  (!param || err.param === param || Boolean(err.param?.startsWith(param)));

/** Where the processor's ids are read and written: the pool, or the caller's transaction (one connection). */
type Executor = Pick<Db, 'select' | 'insert' | 'update'>;

export function createProcessor({ db: pool, stripe }: { db: Db; stripe: Stripe }) {
  return {
    stripe,

    async customerFor(
      account: { id: string; email: string; displayName: string },
      opts: { fresh?: boolean; db?: Executor } = {},
    ): Promise<string> {
      const db = opts.db ?? pool;
      if (!opts.fresh) {
        const [row] = await db.select().from(paymentCustomers).where(eq(paymentCustomers.accountId, account.id));
        if (row) return row.customerId;
      }
      const customer = await stripe.customers.create(
        { email: account.email, name: account.displayName, metadata: { account_id: account.id } },
        { idempotencyKey: opts.fresh ? `customer-${account.id}-${Date.now()}` : `customer-${account.id}` },
      );
      await db
        .insert(paymentCustomers)
        .values({ accountId: account.id, customerId: customer.id })
        .onConflictDoUpdate({ target: paymentCustomers.accountId, set: { customerId: customer.id } });
      return customer.id;
    },

    async productFor(campaign: typeof campaigns.$inferSelect, opts: { fresh?: boolean; db?: Executor } = {}): Promise<string> {
      const db = opts.db ?? pool;
      if (campaign.processorProductId && !opts.fresh) return campaign.processorProductId;
      const product = await stripe.products.create(
        { name: campaign.title, metadata: { campaign_id: campaign.id } },
        { idempotencyKey: opts.fresh ? `product-${campaign.id}-${Date.now()}` : `product-${campaign.id}` },
      );
      await db.update(campaigns).set({ processorProductId: product.id }).where(eq(campaigns.id, campaign.id));
      return product.id;
    },

    /** The standing monthly price of a tier at its minimum amount. */
    async monthlyPriceFor(
      tier: typeof tiers.$inferSelect,
      currency: string,
      productId: string,
      opts: { fresh?: boolean; db?: Executor } = {},
    ): Promise<string> {
      const db = opts.db ?? pool;
      if (tier.processorPriceId && !opts.fresh) return tier.processorPriceId;
      const price = await stripe.prices.create(
        {
          product: productId,
          currency: currency.toLowerCase(),
          unit_amount: tier.minAmountMinor,
          recurring: { interval: 'month' },
          metadata: { tier_id: tier.id },
        },
        { idempotencyKey: `price-${tier.id}-${tier.minAmountMinor}-${productId}` },
      );
      await db
        .update(tiers)
        .set({ processorPriceId: price.id })
        .where(
          and(
            eq(tiers.id, tier.id),
            tier.processorPriceId ? eq(tiers.processorPriceId, tier.processorPriceId) : isNull(tiers.processorPriceId),
          ),
        );
      return price.id;
    },

    async chargeFacts(chargeId: string, invoiceId?: string | null): Promise<ChargeFacts> {
      const charge = await stripe.charges.retrieve(chargeId);
      const btId = typeof charge.balance_transaction === 'string' ? charge.balance_transaction : (charge.balance_transaction?.id ?? null);
      const balanceTransaction = btId ? await stripe.balanceTransactions.retrieve(btId) : null;
      return { charge, balanceTransaction, invoiceId: invoiceId ?? null };
    },

    /** The charge behind a payment intent, when it succeeded. */
    async chargeOfPaymentIntent(piId: string, invoiceId?: string | null): Promise<ChargeFacts | null> {
      const pi = await stripe.paymentIntents.retrieve(piId);
      const chargeId = typeof pi.latest_charge === 'string' ? pi.latest_charge : (pi.latest_charge?.id ?? null);
      if (pi.status !== 'succeeded' || !chargeId) return null;
      return this.chargeFacts(chargeId, invoiceId);
    },
  };
}

export type Processor = ReturnType<typeof createProcessor>;
