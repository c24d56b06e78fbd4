// The processor's behaviour: objects, charges, subscriptions on the fake clock, balance and payouts, events.
import { cardFeeMinor, declineFor, testPaymentMethodTokens, type CardBehaviour, type Decline, type FeeSchedule } from './cards';
import { ApiError, invalid, mergeMetadata, missingParam, noSuch, type Reader } from './params';
import { newId, type ApiObject, type CollectionName, type Store } from './store';
import type { WebhookSender } from './webhooks';

export const API_VERSION = '2026-10-28.endive';
const DAY = 86_400;

export interface EngineOptions {
  publicBaseUrl: () => string;
  fees: FeeSchedule;
  /** Days between a failed renewal attempt and the next one; after the last, the subscription ends. */
  renewalRetryDays: readonly number[];
  /** What a subscription becomes when its last renewal attempt fails. */
  subscriptionStatusAfterFailedRetries: 'canceled' | 'unpaid';
  /** Charge funds become available for payout this long after the charge. */
  availableAfterSeconds: number;
  /** Dispute fee in minor units (US 15.00, from memory). */
  disputeFeeMinor: number;
  autoPayouts: boolean;
  /** A checkout session stays open this long (the processor's default is 24 h). */
  checkoutExpirySeconds: number;
  dropWebhooks: () => boolean;
}

export interface RequestContext {
  requestId: string | null;
  idempotencyKey: string | null;
}

export interface CardInput {
  behaviour: CardBehaviour;
  last4: string;
  expMonth: number;
  expYear: number;
  name?: string;
  email?: string;
}

/** Smallest chargeable amounts per currency (processor documentation, from memory). */
const minimumChargeMinor: Record<string, number> = { usd: 50, eur: 50, gbp: 30, cad: 50, aud: 50, chf: 50, jpy: 50 };

export function clone<T>(value: T): T {
  return JSON.parse(JSON.stringify(value)) as T;
}

function addInterval(fromSeconds: number, interval: string, count: number): number {
  const d = new Date(fromSeconds * 1000);
  switch (interval) {
    case 'day':
      return fromSeconds + count * DAY;
    case 'week':
      return fromSeconds + count * 7 * DAY;
    case 'year':
      d.setUTCFullYear(d.getUTCFullYear() + count);
      return Math.floor(d.getTime() / 1000);
    default: {
      // month: keep the day of month, clamped to the month's length (31 Jan → 28/29 Feb)
      const day = d.getUTCDate();
      d.setUTCDate(1);
      d.setUTCMonth(d.getUTCMonth() + count);
      const lastDay = new Date(Date.UTC(d.getUTCFullYear(), d.getUTCMonth() + 1, 0)).getUTCDate();
      d.setUTCDate(Math.min(day, lastDay));
      return Math.floor(d.getTime() / 1000);
    }
  }
}

function listOf(data: ApiObject[], url: string): ApiObject {
  return { object: 'list', data, has_more: false, total_count: data.length, url } as unknown as ApiObject;
}

export class Engine {
  ctx: RequestContext = { requestId: null, idempotencyKey: null };

  constructor(
    readonly store: Store,
    readonly webhooks: WebhookSender,
    readonly opts: EngineOptions,
  ) {
    if (store.state.lastPayoutRunAt === null) store.state.lastPayoutRunAt = this.now();
  }

  // ---------- clock ----------
  now(): number {
    return Math.floor(Date.now() / 1000) + this.store.state.clockOffsetSeconds;
  }

  private moveClockTo(t: number): void {
    const current = this.now();
    if (t > current) this.store.state.clockOffsetSeconds += t - current;
  }

  /** Moves the clock forward, running every renewal, retry, expiry and payout that falls due on the way, in time order. */
  advance(seconds: number): number {
    if (!Number.isFinite(seconds) || seconds < 0) throw invalid('seconds must be a non-negative number', 'seconds');
    const target = this.now() + Math.floor(seconds);
    this.processDue(target);
    this.moveClockTo(target);
    this.refreshBalance();
    return this.now();
  }

  /** Runs what fell due up to `target`; returns how many tasks ran. */
  processDue(target = this.now()): number {
    let ran = 0;
    for (; ran < 100_000; ran++) {
      const task = this.nextTask(target);
      if (!task) break;
      this.moveClockTo(task.at);
      this.refreshBalance();
      task.run();
    }
    this.refreshBalance();
    return ran;
  }

  private nextTask(target: number): { at: number; run: () => void } | null {
    let best: { at: number; run: () => void } | null = null;
    const consider = (at: number, run: () => void) => {
      if (at <= target && (!best || at < best.at)) best = { at, run };
    };
    for (const sub of this.store.all('subscription')) {
      if (sub.status === 'active' || sub.status === 'past_due') consider(sub.current_period_end, () => this.renewSubscription(sub));
    }
    for (const inv of this.store.all('invoice')) {
      if (inv.status === 'open' && inv.next_payment_attempt !== null) consider(inv.next_payment_attempt, () => this.attemptInvoice(inv));
    }
    for (const cs of this.store.all('checkout_session')) {
      if (cs.status === 'open') consider(cs.expires_at, () => this.expireSession(cs));
    }
    if (this.opts.autoPayouts && this.store.state.lastPayoutRunAt !== null) {
      consider(this.store.state.lastPayoutRunAt + DAY, () => this.runPayouts());
    }
    return best;
  }

  private refreshBalance(): void {
    const now = this.now();
    for (const txn of this.store.all('balance_transaction')) {
      if (txn.status === 'pending' && txn.available_on <= now) txn.status = 'available';
    }
  }

  // ---------- events ----------
  emit(type: string, obj: ApiObject, previous?: Record<string, unknown>): ApiObject {
    const dropped = this.opts.dropWebhooks();
    const event: ApiObject = {
      id: newId('evt'),
      object: 'event',
      api_version: API_VERSION,
      created: this.now(),
      data: { object: clone(obj), ...(previous ? { previous_attributes: clone(previous) } : {}) },
      livemode: false,
      pending_webhooks: this.webhooks.enabled && !dropped ? 1 : 0,
      request: { id: this.ctx.requestId, idempotency_key: this.ctx.idempotencyKey },
      type,
    };
    this.store.insert('event', event);
    this.webhooks.enqueue(event.id, obj.id, dropped);
    return event;
  }

  // ---------- lookups ----------
  find(name: CollectionName, id: string | undefined, kind: string, param = 'id'): ApiObject {
    if (!id) throw missingParam(param);
    const obj = this.store.getOf(name, id);
    if (!obj || obj.deleted) throw noSuch(kind, id, param);
    return obj;
  }

  // ---------- customers ----------
  createCustomer(r: Reader): ApiObject {
    r.rejectUnknown(['email', 'name', 'description', 'phone', 'metadata', 'payment_method', 'preferred_locales']);
    const customer = this.newCustomer({
      email: r.str('email', { maxLength: 512 }) ?? null,
      name: r.str('name', { maxLength: 256 }) ?? null,
      description: r.str('description') ?? null,
      phone: r.str('phone') ?? null,
      metadata: r.metadata() ?? {},
    });
    return customer;
  }

  private newCustomer(fields: {
    email: string | null;
    name: string | null;
    description?: string | null;
    phone?: string | null;
    metadata?: Record<string, string>;
  }): ApiObject {
    const id = newId('cus', 14);
    const customer = this.store.insert('customer', {
      id,
      object: 'customer',
      address: null,
      balance: 0,
      created: this.now(),
      currency: null,
      default_source: null,
      delinquent: false,
      description: fields.description ?? null,
      discount: null,
      email: fields.email,
      invoice_prefix: id.slice(4, 12).toUpperCase(),
      invoice_settings: { custom_fields: null, default_payment_method: null, footer: null, rendering_options: null },
      livemode: false,
      metadata: fields.metadata ?? {},
      name: fields.name,
      next_invoice_sequence: 1,
      phone: fields.phone ?? null,
      preferred_locales: [],
      shipping: null,
      tax_exempt: 'none',
      test_clock: null,
    });
    this.emit('customer.created', customer);
    return customer;
  }

  updateCustomer(id: string, r: Reader): ApiObject {
    r.rejectUnknown(['email', 'name', 'description', 'phone', 'metadata', 'invoice_settings']);
    const customer = this.find('customer', id, 'customer');
    const previous: Record<string, unknown> = {};
    for (const key of ['email', 'name', 'description', 'phone'] as const) {
      if (r.has(key)) {
        previous[key] = customer[key];
        customer[key] = r.str(key) ?? null;
      }
    }
    if (r.has('metadata')) {
      previous.metadata = customer.metadata;
      customer.metadata = mergeMetadata(customer.metadata, r.metadata());
    }
    const settings = r.obj('invoice_settings');
    if (settings) {
      settings.rejectUnknown(['default_payment_method']);
      const pmId = settings.str('default_payment_method');
      if (pmId) {
        const pm = this.find('payment_method', pmId, 'PaymentMethod', settings.name('default_payment_method'));
        if (pm.customer !== customer.id)
          throw invalid(`The payment method ${pmId} is not attached to customer ${customer.id}.`, settings.name('default_payment_method'));
      }
      previous.invoice_settings = clone(customer.invoice_settings);
      customer.invoice_settings.default_payment_method = pmId ?? null;
    }
    this.emit('customer.updated', customer, previous);
    return customer;
  }

  deleteCustomer(id: string): ApiObject {
    const customer = this.find('customer', id, 'customer');
    for (const sub of this.store.all('subscription')) {
      if (sub.customer === id && sub.status !== 'canceled' && sub.status !== 'incomplete_expired')
        this.endSubscription(sub, 'cancellation_requested');
    }
    this.store.remove('customer', id);
    this.emit('customer.deleted', customer);
    return { id, object: 'customer', deleted: true } as unknown as ApiObject;
  }

  // ---------- products and prices ----------
  createProduct(r: Reader): ApiObject {
    r.rejectUnknown([
      'name',
      'description',
      'metadata',
      'active',
      'id',
      'default_price_data',
      'images',
      'url',
      'statement_descriptor',
      'unit_label',
    ]);
    const name = r.str('name', { required: true, maxLength: 250 })!;
    const explicitId = r.str('id');
    if (explicitId && this.store.get(explicitId)) throw invalid(`Product already exists.`, 'id', 'resource_already_exists');
    const product = this.newProduct({
      id: explicitId,
      name,
      description: r.str('description') ?? null,
      metadata: r.metadata() ?? {},
      active: r.bool('active') ?? true,
    });
    const dpd = r.obj('default_price_data');
    if (dpd) {
      const price = this.newPriceFrom(dpd, product.id, ['currency', 'unit_amount', 'recurring', 'metadata', 'tax_behavior']);
      product.default_price = price.id;
    }
    return product;
  }

  private newProduct(fields: {
    id?: string;
    name: string;
    description: string | null;
    metadata: Record<string, string>;
    active: boolean;
  }): ApiObject {
    const now = this.now();
    const product = this.store.insert('product', {
      id: fields.id ?? newId('prod', 14),
      object: 'product',
      active: fields.active,
      created: now,
      default_price: null,
      description: fields.description,
      images: [],
      livemode: false,
      marketing_features: [],
      metadata: fields.metadata,
      name: fields.name,
      package_dimensions: null,
      shippable: null,
      statement_descriptor: null,
      tax_code: null,
      type: 'service',
      unit_label: null,
      updated: now,
      url: null,
    });
    this.emit('product.created', product);
    return product;
  }

  updateProduct(id: string, r: Reader): ApiObject {
    r.rejectUnknown(['name', 'description', 'metadata', 'active', 'default_price']);
    const product = this.find('product', id, 'product');
    const previous: Record<string, unknown> = {};
    if (r.has('name')) ((previous.name = product.name), (product.name = r.str('name', { required: true })));
    if (r.has('description')) ((previous.description = product.description), (product.description = r.str('description') ?? null));
    if (r.has('active')) ((previous.active = product.active), (product.active = r.bool('active')));
    if (r.has('metadata')) ((previous.metadata = product.metadata), (product.metadata = mergeMetadata(product.metadata, r.metadata())));
    if (r.has('default_price')) {
      const priceId = r.str('default_price');
      if (priceId) {
        const price = this.find('price', priceId, 'price', 'default_price');
        if (price.product !== product.id) throw invalid('The price must belong to this product.', 'default_price');
      }
      previous.default_price = product.default_price;
      product.default_price = priceId ?? null;
    }
    product.updated = this.now();
    this.emit('product.updated', product, previous);
    return product;
  }

  createPrice(r: Reader): ApiObject {
    r.rejectUnknown([
      'product',
      'product_data',
      'currency',
      'unit_amount',
      'recurring',
      'metadata',
      'nickname',
      'lookup_key',
      'active',
      'tax_behavior',
      'transfer_lookup_key',
    ]);
    let productId = r.str('product');
    const productData = r.obj('product_data');
    if (!productId && !productData) throw missingParam('product');
    if (productId && productData) throw invalid('You may only specify one of these parameters: product, product_data.', 'product_data');
    if (productId) this.find('product', productId, 'product', 'product');
    else {
      productData!.rejectUnknown(['name', 'metadata', 'active', 'statement_descriptor', 'unit_label']);
      productId = this.newProduct({
        name: productData!.str('name', { required: true })!,
        description: null,
        metadata: productData!.metadata() ?? {},
        active: productData!.bool('active') ?? true,
      }).id;
    }
    const lookupKey = r.str('lookup_key', { maxLength: 200 });
    if (lookupKey) {
      const clash = this.store.all('price').find((p) => p.lookup_key === lookupKey);
      if (clash) {
        if (r.bool('transfer_lookup_key')) clash.lookup_key = null;
        else throw invalid(`A price (\`${clash.id}\`) already uses that lookup key.`, 'lookup_key');
      }
    }
    return this.newPriceFrom(r, productId, null, {
      nickname: r.str('nickname') ?? null,
      lookupKey: lookupKey ?? null,
      active: r.bool('active') ?? true,
    });
  }

  /** Builds a price from `currency`, `unit_amount`, `recurring[...]` in `r` (top-level params or a `price_data` hash). */
  private newPriceFrom(
    r: Reader,
    productId: string,
    allowed: string[] | null,
    extra: { nickname?: string | null; lookupKey?: string | null; active?: boolean } = {},
  ): ApiObject {
    if (allowed) r.rejectUnknown(allowed);
    const currencyRaw = r.str('currency', { required: true })!;
    const currency = currencyRaw.toLowerCase();
    if (!/^[a-z]{3}$/.test(currency))
      throw invalid(`Invalid currency: ${currencyRaw}. It must be a three-letter ISO currency code.`, r.name('currency'));
    const unitAmount = r.int('unit_amount', { required: true, min: 0, max: 99_999_999 })!;
    const rec = r.obj('recurring');
    let recurring: Record<string, unknown> | null = null;
    if (rec) {
      rec.rejectUnknown(['interval', 'interval_count', 'usage_type', 'trial_period_days']);
      const interval = rec.str('interval', { required: true, oneOf: ['day', 'week', 'month', 'year'] })!;
      const intervalCount = rec.int('interval_count', { min: 1, max: interval === 'year' ? 3 : interval === 'month' ? 36 : 365 }) ?? 1;
      recurring = { interval, interval_count: intervalCount, meter: null, trial_period_days: null, usage_type: 'licensed' };
    }
    const price = this.store.insert('price', {
      id: newId('price', 24),
      object: 'price',
      active: extra.active ?? true,
      billing_scheme: 'per_unit',
      created: this.now(),
      currency,
      custom_unit_amount: null,
      livemode: false,
      lookup_key: extra.lookupKey ?? null,
      metadata: r.metadata() ?? {},
      nickname: extra.nickname ?? null,
      product: productId,
      recurring,
      tax_behavior: r.str('tax_behavior', { oneOf: ['exclusive', 'inclusive', 'unspecified'] }) ?? 'unspecified',
      tiers_mode: null,
      transform_quantity: null,
      type: recurring ? 'recurring' : 'one_time',
      unit_amount: unitAmount,
      unit_amount_decimal: String(unitAmount),
    });
    this.emit('price.created', price);
    return price;
  }

  updatePrice(id: string, r: Reader): ApiObject {
    r.rejectUnknown(['active', 'metadata', 'nickname', 'lookup_key']);
    const price = this.find('price', id, 'price');
    const previous: Record<string, unknown> = {};
    if (r.has('active')) ((previous.active = price.active), (price.active = r.bool('active')));
    if (r.has('nickname')) ((previous.nickname = price.nickname), (price.nickname = r.str('nickname') ?? null));
    if (r.has('lookup_key')) ((previous.lookup_key = price.lookup_key), (price.lookup_key = r.str('lookup_key') ?? null));
    if (r.has('metadata')) ((previous.metadata = price.metadata), (price.metadata = mergeMetadata(price.metadata, r.metadata())));
    this.emit('price.updated', price, previous);
    return price;
  }

  // ---------- checkout ----------
  createCheckoutSession(r: Reader): ApiObject {
    r.rejectUnknown([
      'mode',
      'line_items',
      'success_url',
      'cancel_url',
      'customer',
      'customer_email',
      'customer_creation',
      'metadata',
      'client_reference_id',
      'subscription_data',
      'payment_intent_data',
      'expires_at',
      'locale',
      'payment_method_types',
      'submit_type',
      'billing_address_collection',
      'allow_promotion_codes',
      'ui_mode',
    ]);
    const mode = r.str('mode', { required: true, oneOf: ['payment', 'subscription', 'setup'] })!;
    if (mode === 'setup')
      throw invalid('This local processor does not support mode `setup`; use a billing portal session to change a card.', 'mode');
    const uiMode = r.str('ui_mode', { oneOf: ['hosted'] });
    void uiMode;
    const successUrl = r.str('success_url', { required: true, maxLength: 5000 })!;
    const cancelUrl = r.str('cancel_url', { maxLength: 5000 }) ?? null;
    for (const [param, url] of [
      ['success_url', successUrl],
      ['cancel_url', cancelUrl],
    ] as const) {
      if (url && !/^https?:\/\//.test(url)) throw invalid(`Not a valid URL`, param, 'url_invalid');
    }
    const customerId = r.str('customer');
    const customerEmail = r.str('customer_email');
    if (customerId && customerEmail)
      throw invalid('You may only specify one of these parameters: customer, customer_email.', 'customer_email');
    if (customerId) this.find('customer', customerId, 'customer', 'customer');
    const customerCreation = r.str('customer_creation', { oneOf: ['always', 'if_required'] });
    if (customerCreation && mode !== 'payment')
      throw invalid('`customer_creation` can only be used in `payment` mode.', 'customer_creation');
    const clientReferenceId = r.str('client_reference_id', { maxLength: 200 }) ?? null;

    const items = r.list('line_items', { required: true })!;
    if (items.length === 0) throw missingParam('line_items');
    const lineItems: ApiObject[] = [];
    for (const item of items) {
      item.rejectUnknown(['price', 'price_data', 'quantity', 'adjustable_quantity', 'tax_rates']);
      const quantity = item.int('quantity', { required: true, min: 1, max: 999_999 })!;
      const priceId = item.str('price');
      const priceData = item.obj('price_data');
      if (!priceId && !priceData) throw missingParam(item.name('price'));
      if (priceId && priceData) throw invalid('You may only specify one of these parameters: price, price_data.', item.name('price_data'));
      let price: ApiObject;
      if (priceId) {
        price = this.find('price', priceId, 'price', item.name('price'));
        if (!price.active) throw invalid(`The price \`${priceId}\` is not active.`, item.name('price'));
      } else {
        const productRef = priceData!.str('product');
        const productData = priceData!.obj('product_data');
        let productId: string;
        if (productRef) productId = this.find('product', productRef, 'product', priceData!.name('product')).id;
        else if (productData) {
          productData.rejectUnknown(['name', 'description', 'metadata', 'images']);
          productId = this.newProduct({
            name: productData.str('name', { required: true })!,
            description: productData.str('description') ?? null,
            metadata: productData.metadata() ?? {},
            active: false,
          }).id;
        } else throw missingParam(priceData!.name('product'));
        price = this.newPriceFrom(
          priceData!,
          productId,
          ['currency', 'unit_amount', 'product', 'product_data', 'recurring', 'tax_behavior'],
          { active: false },
        );
      }
      if (mode === 'payment' && price.type === 'recurring') {
        throw invalid(
          'You specified `payment` mode but passed a recurring price. Either switch to `subscription` mode or use only one-time prices.',
          item.name(priceId ? 'price' : 'price_data'),
        );
      }
      const product = this.store.get(price.product);
      lineItems.push({
        id: newId('li', 24),
        object: 'item',
        amount_discount: 0,
        amount_subtotal: price.unit_amount * quantity,
        amount_tax: 0,
        amount_total: price.unit_amount * quantity,
        currency: price.currency,
        description: product?.name ?? null,
        metadata: {},
        price: clone(price),
        quantity,
        created: this.now(),
      });
    }
    const currency = lineItems[0]!.currency as string;
    if (lineItems.some((li) => li.currency !== currency)) throw invalid('All line items must use the same currency.', 'line_items');
    if (mode === 'subscription') {
      const recurring = lineItems.filter((li) => li.price.type === 'recurring');
      if (recurring.length === 0)
        throw invalid('You must provide at least one recurring price in `subscription` mode when using prices.', 'line_items');
      const first = recurring[0]!.price.recurring;
      if (
        recurring.some((li) => li.price.recurring.interval !== first.interval || li.price.recurring.interval_count !== first.interval_count)
      ) {
        throw invalid('All recurring prices must have the same billing interval.', 'line_items');
      }
    }
    const amountTotal = lineItems.reduce((sum, li) => sum + (li.amount_total as number), 0);
    const minimum = minimumChargeMinor[currency];
    if (minimum !== undefined && amountTotal < minimum && !(mode === 'subscription' && amountTotal === 0)) {
      throw invalid(
        `The Checkout Session's total amount due must add up to at least ${minimum} ${currency} (minor units).`,
        'line_items',
        'amount_too_small',
      );
    }

    const subscriptionData = r.obj('subscription_data');
    if (subscriptionData && mode !== 'subscription')
      throw invalid('`subscription_data` can only be used in `subscription` mode.', 'subscription_data');
    subscriptionData?.rejectUnknown(['metadata', 'description']);
    const piData = r.obj('payment_intent_data');
    if (piData && mode !== 'payment') throw invalid('`payment_intent_data` can only be used in `payment` mode.', 'payment_intent_data');
    piData?.rejectUnknown(['metadata', 'description', 'receipt_email', 'setup_future_usage', 'statement_descriptor']);

    const now = this.now();
    const expiresAt = r.int('expires_at', { min: now + 1800, max: now + DAY }) ?? now + this.opts.checkoutExpirySeconds;
    const id = `cs_test_${newId('x', 58).slice(2)}`;
    const session = this.store.insert('checkout_session', {
      id,
      object: 'checkout.session',
      after_expiration: null,
      allow_promotion_codes: r.bool('allow_promotion_codes') ?? null,
      amount_subtotal: amountTotal,
      amount_total: amountTotal,
      automatic_tax: { enabled: false, liability: null, provider: null, status: null },
      billing_address_collection: r.str('billing_address_collection') ?? null,
      cancel_url: cancelUrl,
      client_reference_id: clientReferenceId,
      client_secret: null,
      created: now,
      currency,
      customer: customerId ?? null,
      customer_creation: mode === 'payment' ? (customerCreation ?? 'if_required') : null,
      customer_details: null,
      customer_email: customerEmail ?? null,
      expires_at: expiresAt,
      invoice: null,
      livemode: false,
      locale: r.str('locale') ?? null,
      metadata: r.metadata() ?? {},
      mode,
      payment_intent: null,
      payment_method_types: ['card'],
      payment_status: 'unpaid',
      status: 'open',
      submit_type: r.str('submit_type') ?? null,
      subscription: null,
      success_url: successUrl,
      total_details: { amount_discount: 0, amount_shipping: 0, amount_tax: 0 },
      ui_mode: 'hosted',
      url: `${this.opts.publicBaseUrl()}/pay/${id}`,
    });
    const internal = this.store.internal(id);
    internal.sessionLineItems = lineItems;
    internal.subscriptionMetadata = subscriptionData?.metadata() ?? {};
    internal.paymentIntentMetadata = piData?.metadata() ?? {};
    internal.paymentIntentDescription = piData?.str('description');
    internal.sessionDescription = (mode === 'subscription' ? subscriptionData : piData)?.str('description') ?? null;
    return session;
  }

  /** What the session pays for, as the caller described it (subscription_data / payment_intent_data description). */
  sessionDescription(id: string): string | null {
    return this.store.internal(id).sessionDescription ?? null;
  }

  sessionLineItems(id: string): ApiObject[] {
    this.find('checkout_session', id, 'checkout session');
    return this.store.internal(id).sessionLineItems ?? [];
  }

  expireSession(session: ApiObject): ApiObject {
    if (session.status !== 'open')
      throw invalid(
        `Only Checkout Sessions with a status in ["open"] can be expired. This Checkout Session has a status of "${session.status}".`,
        'session',
      );
    session.status = 'expired';
    session.url = null;
    this.emit('checkout.session.expired', session);
    return session;
  }

  /** The hosted page's submit. A decline leaves the session open for another try. */
  payCheckoutSession(session: ApiObject, card: CardInput): { ok: true; redirectUrl: string } | { ok: false; decline: Decline } {
    if (session.status !== 'open') throw invalid(`This checkout session is ${session.status}.`, 'session');
    const internal = this.store.internal(session.id);
    const email = card.email ?? session.customer_email ?? null;
    let customer = session.customer ? this.store.getOf('customer', session.customer) : undefined;
    const needsCustomer = session.mode === 'subscription' || session.customer_creation === 'always';
    const pm = this.newPaymentMethod(card, customer?.id ?? null, email);
    const piId = session.payment_intent ?? internal.paymentIntent;
    let pi = piId ? this.store.getOf('payment_intent', piId) : undefined;
    if (!pi) {
      pi = this.newPaymentIntent({
        amount: session.amount_total,
        currency: session.currency,
        customer: customer?.id ?? null,
        description: session.mode === 'subscription' ? 'Subscription creation' : (internal.paymentIntentDescription ?? null),
        metadata: session.mode === 'payment' ? (internal.paymentIntentMetadata ?? {}) : {},
        receiptEmail: email,
      });
      internal.paymentIntent = pi.id;
      if (session.mode === 'payment') session.payment_intent = pi.id;
    }
    const result = this.confirm(pi, pm, null);
    if (!result.ok) return { ok: false, decline: result.decline };

    if (!customer && needsCustomer) {
      customer = this.newCustomer({ email, name: card.name ?? null });
      pi.customer = customer.id;
      const charge = this.store.get(pi.latest_charge);
      if (charge) charge.customer = customer.id;
    }
    if (customer) {
      pm.customer = customer.id;
      if (session.mode === 'subscription') customer.invoice_settings.default_payment_method = pm.id;
    }
    const previous = { status: session.status, payment_status: session.payment_status };
    session.status = 'complete';
    session.payment_status = 'paid';
    session.customer = customer?.id ?? null;
    session.customer_details = { address: null, email, name: card.name ?? null, phone: null, tax_exempt: 'none', tax_ids: [] };
    session.url = null;
    if (session.mode === 'subscription') {
      const { subscription, invoice } = this.startSubscription(session, customer!, pm, pi);
      session.subscription = subscription.id;
      session.invoice = invoice.id;
    }
    this.emit('checkout.session.completed', session, previous);
    return { ok: true, redirectUrl: String(session.success_url).replaceAll('{CHECKOUT_SESSION_ID}', session.id) };
  }

  private startSubscription(
    session: ApiObject,
    customer: ApiObject,
    pm: ApiObject,
    pi: ApiObject,
  ): { subscription: ApiObject; invoice: ApiObject } {
    const lineItems = this.store.internal(session.id).sessionLineItems ?? [];
    const recurring = lineItems.filter((li) => li.price.type === 'recurring');
    const { interval, interval_count: intervalCount } = recurring[0]!.price.recurring;
    const start = this.now();
    const end = addInterval(start, interval, intervalCount);
    const id = newId('sub', 24);
    const items = recurring.map((li) => ({
      id: newId('si', 14),
      object: 'subscription_item',
      billing_thresholds: null,
      created: start,
      current_period_end: end,
      current_period_start: start,
      discounts: [],
      metadata: {},
      plan: this.planOf(li.price),
      price: clone(li.price),
      quantity: li.quantity,
      subscription: id,
      tax_rates: [],
    }));
    const subscription = this.store.insert('subscription', {
      id,
      object: 'subscription',
      application: null,
      application_fee_percent: null,
      automatic_tax: { disabled_reason: null, enabled: false, liability: null },
      billing_cycle_anchor: start,
      billing_cycle_anchor_config: null,
      billing_mode: { type: 'flexible' },
      cancel_at: null,
      cancel_at_period_end: false,
      canceled_at: null,
      cancellation_details: { comment: null, feedback: null, reason: null },
      collection_method: 'charge_automatically',
      created: start,
      currency: session.currency,
      // In this API version the period lives on the items; kept here as well for convenience.
      current_period_end: end,
      current_period_start: start,
      customer: customer.id,
      days_until_due: null,
      default_payment_method: pm.id,
      default_source: null,
      description: null,
      discounts: [],
      ended_at: null,
      invoice_settings: { account_tax_ids: null, issuer: { type: 'self' } },
      items: { object: 'list', data: items, has_more: false, total_count: items.length, url: `/v1/subscription_items?subscription=${id}` },
      latest_invoice: null,
      livemode: false,
      metadata: this.store.internal(session.id).subscriptionMetadata ?? {},
      pause_collection: null,
      payment_settings: { payment_method_options: null, payment_method_types: null, save_default_payment_method: 'off' },
      pending_update: null,
      schedule: null,
      start_date: start,
      status: 'active',
      test_clock: null,
      transfer_data: null,
      trial_end: null,
      trial_start: null,
    });
    this.emit('customer.subscription.created', subscription);
    const invoice = this.newInvoice(subscription, customer, lineItems, 'subscription_create', start, end);
    this.linkInvoicePayment(invoice, pi);
    this.markInvoicePaid(invoice);
    return { subscription, invoice };
  }

  private planOf(price: ApiObject): Record<string, unknown> {
    return {
      id: price.id,
      object: 'plan',
      active: price.active,
      amount: price.unit_amount,
      amount_decimal: String(price.unit_amount),
      billing_scheme: 'per_unit',
      created: price.created,
      currency: price.currency,
      interval: price.recurring?.interval,
      interval_count: price.recurring?.interval_count,
      livemode: false,
      metadata: price.metadata,
      meter: null,
      nickname: price.nickname,
      product: price.product,
      tiers_mode: null,
      transform_usage: null,
      trial_period_days: null,
      usage_type: 'licensed',
    };
  }

  // ---------- payment methods, intents, charges ----------
  newPaymentMethod(card: CardInput, customerId: string | null, email: string | null): ApiObject {
    const pm = this.store.insert('payment_method', {
      id: newId('pm', 24),
      object: 'payment_method',
      allow_redisplay: 'unspecified',
      billing_details: { address: null, email, name: card.name ?? null, phone: null, tax_id: null },
      card: {
        brand: 'visa',
        checks: { address_line1_check: null, address_postal_code_check: null, cvc_check: 'pass' },
        country: 'US',
        display_brand: 'visa',
        exp_month: card.expMonth,
        exp_year: card.expYear,
        fingerprint: `fp${card.last4}local`,
        funding: 'credit',
        last4: card.last4,
        networks: { available: ['visa'], preferred: null },
        wallet: null,
      },
      created: this.now(),
      customer: customerId,
      livemode: false,
      metadata: {},
      type: 'card',
    });
    this.store.internal(pm.id).cardBehaviour = card.behaviour;
    return pm;
  }

  newPaymentIntent(f: {
    amount: number;
    currency: string;
    customer: string | null;
    description: string | null;
    metadata: Record<string, string>;
    receiptEmail: string | null;
    paymentMethod?: string | null;
  }): ApiObject {
    const id = newId('pi', 24);
    const pi = this.store.insert('payment_intent', {
      id,
      object: 'payment_intent',
      amount: f.amount,
      amount_capturable: 0,
      amount_details: { tip: {} },
      amount_received: 0,
      application: null,
      application_fee_amount: null,
      automatic_payment_methods: null,
      canceled_at: null,
      cancellation_reason: null,
      capture_method: 'automatic',
      client_secret: `${id}_secret_${newId('s', 25).slice(2)}`,
      confirmation_method: 'automatic',
      created: this.now(),
      currency: f.currency,
      customer: f.customer,
      description: f.description,
      last_payment_error: null,
      latest_charge: null,
      livemode: false,
      metadata: f.metadata,
      next_action: null,
      on_behalf_of: null,
      payment_method: f.paymentMethod ?? null,
      payment_method_configuration_details: null,
      payment_method_options: { card: { request_three_d_secure: 'automatic' } },
      payment_method_types: ['card'],
      processing: null,
      receipt_email: f.receiptEmail,
      review: null,
      setup_future_usage: null,
      shipping: null,
      source: null,
      statement_descriptor: null,
      statement_descriptor_suffix: null,
      status: f.paymentMethod ? 'requires_confirmation' : 'requires_payment_method',
      transfer_data: null,
      transfer_group: null,
    });
    this.emit('payment_intent.created', pi);
    return pi;
  }

  /** Charges the card behind `pm` for the intent. `forcedDecline` models a card on file that now fails. */
  confirm(
    pi: ApiObject,
    pm: ApiObject,
    forcedDecline: Decline | null,
  ): { ok: true; charge: ApiObject } | { ok: false; decline: Decline; charge: ApiObject } {
    if (pi.status === 'succeeded')
      throw invalid('This PaymentIntent has already succeeded and cannot be confirmed again.', 'intent', 'payment_intent_unexpected_state');
    if (pi.status === 'canceled') throw invalid('This PaymentIntent is canceled.', 'intent', 'payment_intent_unexpected_state');
    const behaviour = (this.store.internal(pm.id).cardBehaviour ?? 'succeeds') as CardBehaviour;
    const decline = forcedDecline ?? declineFor(behaviour);
    const now = this.now();
    const charge = this.store.insert('charge', {
      id: newId('ch', 24),
      object: 'charge',
      amount: pi.amount,
      amount_captured: decline ? 0 : pi.amount,
      amount_refunded: 0,
      application: null,
      application_fee: null,
      application_fee_amount: null,
      balance_transaction: null,
      billing_details: clone(pm.billing_details),
      calculated_statement_descriptor: 'LOCAL TEST',
      captured: !decline,
      created: now,
      currency: pi.currency,
      customer: pi.customer,
      description: pi.description,
      disputed: false,
      failure_balance_transaction: null,
      failure_code: decline ? decline.code : null,
      failure_message: decline ? decline.message : null,
      fraud_details: {},
      livemode: false,
      metadata: clone(pi.metadata),
      on_behalf_of: null,
      outcome: decline
        ? {
            network_status: 'declined_by_network',
            reason: decline.declineCode,
            risk_level: 'normal',
            risk_score: 20,
            seller_message: 'The bank did not return any further details with this decline.',
            type: 'issuer_declined',
          }
        : {
            network_status: 'approved_by_network',
            reason: null,
            risk_level: 'normal',
            risk_score: 20,
            seller_message: 'Payment complete.',
            type: 'authorized',
          },
      paid: !decline,
      payment_intent: pi.id,
      payment_method: pm.id,
      payment_method_details: {
        type: 'card',
        card: {
          brand: pm.card.brand,
          country: 'US',
          exp_month: pm.card.exp_month,
          exp_year: pm.card.exp_year,
          funding: 'credit',
          last4: pm.card.last4,
          network: 'visa',
        },
      },
      receipt_email: pi.receipt_email,
      receipt_url: null,
      refunded: false,
      review: null,
      shipping: null,
      source: null,
      statement_descriptor: null,
      statement_descriptor_suffix: null,
      status: decline ? 'failed' : 'succeeded',
      transfer_group: null,
    });
    pi.latest_charge = charge.id;
    pi.payment_method = pm.id;
    if (decline) {
      pi.status = 'requires_payment_method';
      pi.last_payment_error = {
        type: 'card_error',
        charge: charge.id,
        code: decline.code,
        decline_code: decline.declineCode,
        message: decline.message,
        payment_method: clone(pm),
      };
      this.emit('charge.failed', charge);
      this.emit('payment_intent.payment_failed', pi);
      return { ok: false, decline, charge };
    }
    const fee = cardFeeMinor(charge.amount, this.opts.fees);
    const txn = this.newBalanceTransaction({
      amount: charge.amount,
      currency: charge.currency,
      fee,
      feeDescription: 'Processing fees',
      source: charge.id,
      type: 'charge',
      reportingCategory: 'charge',
      availableOn: now + this.opts.availableAfterSeconds,
      description: charge.description,
    });
    charge.balance_transaction = txn.id;
    pi.status = 'succeeded';
    pi.amount_received = pi.amount;
    pi.last_payment_error = null;
    this.emit('charge.succeeded', charge);
    this.emit('payment_intent.succeeded', pi);
    if (behaviour === 'dispute' && !forcedDecline) this.openDispute(charge, 'fraudulent');
    return { ok: true, charge };
  }

  resolvePaymentMethod(ref: string, param: string, customerId: string | null): ApiObject {
    const token = testPaymentMethodTokens[ref];
    if (token) {
      const year = new Date(this.now() * 1000).getUTCFullYear() + 3;
      return this.newPaymentMethod({ behaviour: token.behaviour, last4: token.last4, expMonth: 12, expYear: year }, customerId, null);
    }
    return this.find('payment_method', ref, 'PaymentMethod', param);
  }

  createPaymentIntent(r: Reader): ApiObject {
    r.rejectUnknown([
      'amount',
      'currency',
      'customer',
      'description',
      'metadata',
      'payment_method',
      'confirm',
      'receipt_email',
      'off_session',
      'payment_method_types',
      'automatic_payment_methods',
      'statement_descriptor',
    ]);
    const amount = r.int('amount', { required: true, min: 1, max: 99_999_999 })!;
    const currency = r.str('currency', { required: true })!.toLowerCase();
    if (!/^[a-z]{3}$/.test(currency)) throw invalid(`Invalid currency: ${currency}.`, 'currency');
    const minimum = minimumChargeMinor[currency];
    if (minimum !== undefined && amount < minimum)
      throw invalid(`Amount must be at least ${minimum} ${currency} (minor units).`, 'amount', 'amount_too_small');
    const customerId = r.str('customer') ?? null;
    if (customerId) this.find('customer', customerId, 'customer', 'customer');
    const pmRef = r.str('payment_method');
    const pm = pmRef ? this.resolvePaymentMethod(pmRef, 'payment_method', customerId) : undefined;
    const pi = this.newPaymentIntent({
      amount,
      currency,
      customer: customerId,
      description: r.str('description') ?? null,
      metadata: r.metadata() ?? {},
      receiptEmail: r.str('receipt_email') ?? null,
      paymentMethod: pm?.id ?? null,
    });
    if (r.bool('confirm')) {
      if (!pm)
        throw invalid(
          "You cannot confirm this PaymentIntent because it's missing a payment method.",
          'payment_method',
          'payment_intent_unexpected_state',
        );
      this.confirmOrThrow(pi, pm);
    }
    return pi;
  }

  confirmPaymentIntent(id: string, r: Reader): ApiObject {
    r.rejectUnknown(['payment_method', 'off_session', 'return_url', 'receipt_email']);
    const pi = this.find('payment_intent', id, 'payment_intent');
    const pmRef = r.str('payment_method') ?? pi.payment_method;
    if (!pmRef)
      throw invalid(
        "You cannot confirm this PaymentIntent because it's missing a payment method.",
        'payment_method',
        'payment_intent_unexpected_state',
      );
    this.confirmOrThrow(pi, this.resolvePaymentMethod(pmRef, 'payment_method', pi.customer));
    return pi;
  }

  private confirmOrThrow(pi: ApiObject, pm: ApiObject): void {
    const result = this.confirm(pi, pm, null);
    if (!result.ok) {
      throw new ApiError(402, {
        type: 'card_error',
        code: result.decline.code,
        decline_code: result.decline.declineCode,
        message: result.decline.message,
        charge: result.charge.id,
        payment_intent: clone(pi),
      });
    }
  }

  updatePaymentIntent(id: string, r: Reader): ApiObject {
    r.rejectUnknown(['description', 'metadata', 'receipt_email']);
    const pi = this.find('payment_intent', id, 'payment_intent');
    if (r.has('description')) pi.description = r.str('description') ?? null;
    if (r.has('receipt_email')) pi.receipt_email = r.str('receipt_email') ?? null;
    if (r.has('metadata')) pi.metadata = mergeMetadata(pi.metadata, r.metadata());
    return pi;
  }

  cancelPaymentIntent(id: string, r: Reader): ApiObject {
    r.rejectUnknown(['cancellation_reason']);
    const pi = this.find('payment_intent', id, 'payment_intent');
    if (pi.status === 'succeeded' || pi.status === 'canceled') {
      throw invalid(
        `You cannot cancel this PaymentIntent because it has a status of ${pi.status}.`,
        'intent',
        'payment_intent_unexpected_state',
      );
    }
    pi.status = 'canceled';
    pi.canceled_at = this.now();
    pi.cancellation_reason =
      r.str('cancellation_reason', { oneOf: ['duplicate', 'fraudulent', 'requested_by_customer', 'abandoned'] }) ?? null;
    this.emit('payment_intent.canceled', pi);
    return pi;
  }

  updateCharge(id: string, r: Reader): ApiObject {
    r.rejectUnknown(['description', 'metadata']);
    const charge = this.find('charge', id, 'charge');
    const previous: Record<string, unknown> = {};
    if (r.has('description')) ((previous.description = charge.description), (charge.description = r.str('description') ?? null));
    if (r.has('metadata')) ((previous.metadata = charge.metadata), (charge.metadata = mergeMetadata(charge.metadata, r.metadata())));
    this.emit('charge.updated', charge, previous);
    return charge;
  }

  // ---------- balance ----------
  private newBalanceTransaction(f: {
    amount: number;
    currency: string;
    fee: number;
    feeDescription: string;
    source: string;
    type: string;
    reportingCategory: string;
    availableOn: number;
    description: string | null;
  }): ApiObject {
    return this.store.insert('balance_transaction', {
      id: newId('txn', 24),
      object: 'balance_transaction',
      amount: f.amount,
      available_on: f.availableOn,
      balance_type: 'payments',
      created: this.now(),
      currency: f.currency,
      description: f.description,
      exchange_rate: null,
      fee: f.fee,
      fee_details:
        f.fee > 0 ? [{ amount: f.fee, application: null, currency: f.currency, description: f.feeDescription, type: 'stripe_fee' }] : [],
      net: f.amount - f.fee,
      reporting_category: f.reportingCategory,
      source: f.source,
      status: f.availableOn <= this.now() ? 'available' : 'pending',
      type: f.type,
    });
  }

  balance(): ApiObject {
    const sums = (status: string) => {
      const byCurrency = new Map<string, number>();
      for (const txn of this.store.all('balance_transaction')) {
        if (txn.status !== status || (txn.type !== 'payout' && this.store.internal(txn.id).payout)) continue;
        if (txn.type === 'payout') continue;
        byCurrency.set(txn.currency, (byCurrency.get(txn.currency) ?? 0) + txn.net);
      }
      return [...byCurrency].map(([currency, amount]) => ({ amount, currency, source_types: { card: amount } }));
    };
    return { object: 'balance', available: sums('available'), pending: sums('pending'), livemode: false } as unknown as ApiObject;
  }

  // ---------- refunds and disputes ----------
  createRefund(r: Reader): ApiObject {
    r.rejectUnknown(['charge', 'payment_intent', 'amount', 'reason', 'metadata']);
    const chargeId = r.str('charge');
    const piId = r.str('payment_intent');
    if (!chargeId && !piId)
      throw invalid(
        'One of the following params should be provided for this request: payment_intent or charge.',
        'charge',
        'parameter_missing',
      );
    if (chargeId && piId) throw invalid('You may only specify one of these parameters: charge, payment_intent.', 'payment_intent');
    let charge: ApiObject;
    if (piId) {
      const pi = this.find('payment_intent', piId, 'payment_intent', 'payment_intent');
      if (pi.status !== 'succeeded' || !pi.latest_charge) {
        throw invalid(
          `This PaymentIntent (${pi.id}) does not have a successful charge to refund.`,
          'payment_intent',
          'charge_not_refundable',
        );
      }
      charge = this.find('charge', pi.latest_charge, 'charge', 'payment_intent');
    } else charge = this.find('charge', chargeId, 'charge', 'charge');
    if (charge.status !== 'succeeded')
      throw invalid(`Charge ${charge.id} has not succeeded and cannot be refunded.`, 'charge', 'charge_not_refundable');
    if (charge.disputed) throw invalid(`Charge ${charge.id} has been charged back; cannot issue a refund.`, 'charge', 'charge_disputed');
    const remaining = charge.amount - charge.amount_refunded;
    if (remaining <= 0) throw invalid(`Charge ${charge.id} has already been refunded.`, 'charge', 'charge_already_refunded');
    const amount = r.int('amount', { min: 1 }) ?? remaining;
    if (amount > remaining) {
      throw invalid(`Refund amount (${amount}) is greater than unrefunded amount on charge (${remaining}).`, 'amount', 'amount_too_large');
    }
    const reason = r.str('reason', { oneOf: ['duplicate', 'fraudulent', 'requested_by_customer'] }) ?? null;
    const refund = this.store.insert('refund', {
      id: newId('re', 24),
      object: 'refund',
      amount,
      balance_transaction: null,
      charge: charge.id,
      created: this.now(),
      currency: charge.currency,
      destination_details: {
        card: { reference_status: 'pending', reference_type: 'acquirer_reference_number', type: 'refund' },
        type: 'card',
      },
      metadata: r.metadata() ?? {},
      payment_intent: charge.payment_intent,
      reason,
      receipt_number: null,
      source_transfer_reversal: null,
      status: 'succeeded',
      transfer_reversal: null,
    });
    // The processor keeps the original fee on a refund (common practice since its 2017 pricing change).
    const txn = this.newBalanceTransaction({
      amount: -amount,
      currency: charge.currency,
      fee: 0,
      feeDescription: '',
      source: refund.id,
      type: 'refund',
      reportingCategory: 'refund',
      availableOn: this.now(),
      description: 'REFUND FOR CHARGE',
    });
    refund.balance_transaction = txn.id;
    const previous = { amount_refunded: charge.amount_refunded, refunded: charge.refunded };
    charge.amount_refunded += amount;
    charge.refunded = charge.amount_refunded === charge.amount;
    this.emit('refund.created', refund);
    this.emit('charge.refunded', charge, previous);
    return refund;
  }

  openDispute(charge: ApiObject, reason: string): ApiObject {
    if (charge.status !== 'succeeded') throw invalid(`Charge ${charge.id} did not succeed; it cannot be disputed.`, 'charge');
    if (charge.disputed) throw invalid(`Charge ${charge.id} is already disputed.`, 'charge');
    const amount = charge.amount - charge.amount_refunded;
    const now = this.now();
    const id = newId('dp', 24);
    const txn = this.newBalanceTransaction({
      amount: -amount,
      currency: charge.currency,
      fee: this.opts.disputeFeeMinor,
      feeDescription: 'Dispute fee',
      source: id,
      type: 'adjustment',
      reportingCategory: 'dispute',
      availableOn: now,
      description: `Chargeback withdrawal for ${charge.id}`,
    });
    const dispute = this.store.insert('dispute', {
      id,
      object: 'dispute',
      amount,
      balance_transactions: [clone(txn)],
      charge: charge.id,
      created: now,
      currency: charge.currency,
      enhanced_eligibility_types: [],
      evidence: {},
      evidence_details: { due_by: now + 7 * DAY, enhanced_eligibility: {}, has_evidence: false, past_due: false, submission_count: 0 },
      is_charge_refundable: false,
      livemode: false,
      metadata: {},
      payment_intent: charge.payment_intent,
      payment_method_details: { card: { brand: 'visa', case_type: 'chargeback', network_reason_code: '10.4' }, type: 'card' },
      reason,
      status: 'needs_response',
    });
    const previous = { disputed: false };
    charge.disputed = true;
    this.emit('charge.dispute.created', dispute);
    this.emit('charge.dispute.funds_withdrawn', dispute);
    this.emit('charge.updated', charge, previous);
    return dispute;
  }

  /**
   * Ends a dispute. Won: the withdrawn amount comes back in a reversal balance transaction (the dispute fee is
   * kept, as the processor's published terms say — from memory); lost: nothing comes back.
   */
  closeDispute(dispute: ApiObject, outcome: 'won' | 'lost'): ApiObject {
    if (dispute.status === 'won' || dispute.status === 'lost') throw invalid(`Dispute ${dispute.id} is already closed.`, 'dispute');
    const previous = { status: dispute.status };
    if (outcome === 'won') {
      const txn = this.newBalanceTransaction({
        amount: dispute.amount,
        currency: dispute.currency,
        fee: 0,
        feeDescription: '',
        source: dispute.id,
        type: 'adjustment',
        reportingCategory: 'dispute_reversal',
        availableOn: this.now(),
        description: `Chargeback reversal for ${dispute.charge}`,
      });
      dispute.balance_transactions = [...dispute.balance_transactions, clone(txn)];
      this.emit('charge.dispute.funds_reinstated', dispute);
    }
    dispute.status = outcome;
    dispute.is_charge_refundable = false;
    this.emit('charge.dispute.closed', dispute, previous);
    return dispute;
  }

  /**
   * Seeds charges with their balance transactions straight into the store, without events, for benchmarks:
   * `count` charges of `amountMinor` spread one second apart ending now. Returns the charge ids.
   */
  seedCharges(count: number, opts: { amountMinor?: number; currency?: string } = {}): { chargeId: string; balanceTransactionId: string }[] {
    const amount = opts.amountMinor ?? 2500;
    const currency = (opts.currency ?? 'usd').toLowerCase();
    const out: { chargeId: string; balanceTransactionId: string }[] = [];
    const start = this.now() - count;
    for (let i = 0; i < count; i++) {
      const created = start + i;
      const chargeId = newId('ch', 24);
      const txnId = newId('txn', 24);
      const feeMinor = cardFeeMinor(amount, this.opts.fees);
      this.store.insert('balance_transaction', {
        id: txnId,
        object: 'balance_transaction',
        amount,
        available_on: created + this.opts.availableAfterSeconds,
        balance_type: 'payments',
        created,
        currency,
        description: 'Seeded charge',
        exchange_rate: null,
        fee: feeMinor,
        fee_details: [{ amount: feeMinor, application: null, currency, description: 'Processing fees', type: 'stripe_fee' }],
        net: amount - feeMinor,
        reporting_category: 'charge',
        source: chargeId,
        status: 'pending',
        type: 'charge',
      });
      this.store.insert('charge', {
        id: chargeId,
        object: 'charge',
        amount,
        amount_captured: amount,
        amount_refunded: 0,
        balance_transaction: txnId,
        captured: true,
        created,
        currency,
        customer: null,
        description: 'Seeded charge',
        disputed: false,
        metadata: {},
        paid: true,
        payment_intent: null,
        refunded: false,
        status: 'succeeded',
      });
      out.push({ chargeId, balanceTransactionId: txnId });
    }
    return out;
  }

  // ---------- subscriptions and invoices ----------
  updateSubscription(id: string, r: Reader): ApiObject {
    r.rejectUnknown(['cancel_at_period_end', 'metadata', 'default_payment_method', 'description', 'cancellation_details']);
    const sub = this.find('subscription', id, 'subscription');
    if (sub.status === 'canceled')
      throw invalid('A canceled subscription can only update its cancellation_details and metadata.', 'subscription');
    const previous: Record<string, unknown> = {};
    const cape = r.bool('cancel_at_period_end');
    if (cape !== undefined && cape !== sub.cancel_at_period_end) {
      previous.cancel_at_period_end = sub.cancel_at_period_end;
      previous.cancel_at = sub.cancel_at;
      previous.canceled_at = sub.canceled_at;
      sub.cancel_at_period_end = cape;
      sub.cancel_at = cape ? sub.current_period_end : null;
      sub.canceled_at = cape ? this.now() : null;
    }
    const details = r.obj('cancellation_details');
    if (details) {
      details.rejectUnknown(['comment', 'feedback']);
      previous.cancellation_details = clone(sub.cancellation_details);
      if (details.has('comment')) sub.cancellation_details.comment = details.str('comment') ?? null;
      if (details.has('feedback')) sub.cancellation_details.feedback = details.str('feedback') ?? null;
    }
    if (r.has('metadata')) ((previous.metadata = sub.metadata), (sub.metadata = mergeMetadata(sub.metadata, r.metadata())));
    if (r.has('description')) ((previous.description = sub.description), (sub.description = r.str('description') ?? null));
    if (r.has('default_payment_method')) {
      const pmId = r.str('default_payment_method');
      if (pmId) {
        const pm = this.find('payment_method', pmId, 'PaymentMethod', 'default_payment_method');
        if (pm.customer !== sub.customer)
          throw invalid(`The payment method ${pmId} is not attached to the subscription's customer.`, 'default_payment_method');
      }
      previous.default_payment_method = sub.default_payment_method;
      sub.default_payment_method = pmId ?? null;
    }
    if (Object.keys(previous).length > 0) this.emit('customer.subscription.updated', sub, previous);
    return sub;
  }

  cancelSubscription(id: string, r: Reader): ApiObject {
    r.rejectUnknown(['invoice_now', 'prorate', 'cancellation_details']);
    const sub = this.find('subscription', id, 'subscription');
    if (sub.status === 'canceled') throw invalid(`No such subscription: '${id}' is already canceled.`, 'subscription', 'resource_missing');
    this.endSubscription(sub, 'cancellation_requested');
    return sub;
  }

  private endSubscription(sub: ApiObject, reason: 'cancellation_requested' | 'payment_failed'): void {
    const now = this.now();
    sub.status = 'canceled';
    sub.canceled_at ??= now;
    sub.ended_at = now;
    sub.cancel_at_period_end = false;
    sub.cancellation_details.reason = reason;
    this.emit('customer.subscription.deleted', sub);
  }

  private renewSubscription(sub: ApiObject): void {
    const at = sub.current_period_end as number;
    if (sub.cancel_at_period_end || (sub.cancel_at !== null && sub.cancel_at <= at)) {
      this.endSubscription(sub, 'cancellation_requested');
      return;
    }
    const { interval, interval_count: intervalCount } = sub.items.data[0].price.recurring;
    const previous = { current_period_start: sub.current_period_start, current_period_end: sub.current_period_end };
    const end = addInterval(at, interval, intervalCount);
    sub.current_period_start = at;
    sub.current_period_end = end;
    for (const item of sub.items.data) {
      item.current_period_start = at;
      item.current_period_end = end;
    }
    const customer = this.store.getOf('customer', sub.customer);
    if (!customer) {
      this.endSubscription(sub, 'cancellation_requested');
      return;
    }
    const lines = sub.items.data.map((item: ApiObject) => ({
      price: item.price,
      quantity: item.quantity,
      amount_total: item.price.unit_amount * item.quantity,
      description: this.store.get(item.price.product)?.name ?? null,
    }));
    const invoice = this.newInvoice(sub, customer, lines, 'subscription_cycle', at, end);
    this.emit('customer.subscription.updated', sub, previous);
    this.attemptInvoice(invoice);
  }

  private newInvoice(
    sub: ApiObject,
    customer: ApiObject,
    lineItems: ApiObject[] | Record<string, any>[],
    billingReason: string,
    periodStart: number,
    periodEnd: number,
  ): ApiObject {
    const now = this.now();
    const id = newId('in', 24);
    const total = lineItems.reduce((sum, li) => sum + (li.amount_total as number), 0);
    const lines = lineItems.map((li) => ({
      id: newId('il', 24),
      object: 'line_item',
      amount: li.amount_total,
      currency: sub.currency,
      description: `${li.quantity} × ${li.description ?? 'item'}`,
      discount_amounts: [],
      discountable: true,
      discounts: [],
      invoice: id,
      livemode: false,
      metadata: {},
      parent: {
        invoice_item_details: null,
        subscription_item_details: {
          invoice_item: null,
          proration: false,
          proration_details: { credited_items: null },
          subscription: sub.id,
          subscription_item: sub.items.data.find((i: ApiObject) => i.price.id === li.price.id)?.id ?? null,
        },
        type: 'subscription_item_details',
      },
      period: { end: li.price.type === 'recurring' ? periodEnd : periodStart, start: periodStart },
      pretax_credit_amounts: [],
      pricing: {
        price_details: { price: li.price.id, product: li.price.product },
        type: 'price_details',
        unit_amount_decimal: String(li.price.unit_amount),
      },
      quantity: li.quantity,
      taxes: [],
    }));
    const sequence = customer.next_invoice_sequence ?? 1;
    customer.next_invoice_sequence = sequence + 1;
    const invoice = this.store.insert('invoice', {
      id,
      object: 'invoice',
      account_country: 'US',
      account_name: 'Local test account',
      account_tax_ids: null,
      amount_due: total,
      amount_overpaid: 0,
      amount_paid: 0,
      amount_remaining: total,
      amount_shipping: 0,
      application: null,
      attempt_count: 0,
      attempted: false,
      auto_advance: true,
      automatic_tax: { disabled_reason: null, enabled: false, liability: null, provider: null, status: null },
      automatically_finalizes_at: null,
      billing_reason: billingReason,
      collection_method: 'charge_automatically',
      created: now,
      currency: sub.currency,
      custom_fields: null,
      customer: customer.id,
      customer_address: null,
      customer_email: customer.email,
      customer_name: customer.name,
      customer_phone: null,
      customer_shipping: null,
      customer_tax_exempt: 'none',
      customer_tax_ids: [],
      default_payment_method: null,
      default_source: null,
      default_tax_rates: [],
      description: null,
      discounts: [],
      due_date: null,
      effective_at: now,
      ending_balance: 0,
      footer: null,
      from_invoice: null,
      hosted_invoice_url: null,
      invoice_pdf: null,
      issuer: { type: 'self' },
      last_finalization_error: null,
      latest_revision: null,
      lines: { object: 'list', data: lines, has_more: false, total_count: lines.length, url: `/v1/invoices/${id}/lines` },
      livemode: false,
      metadata: {},
      next_payment_attempt: null,
      number: `${customer.invoice_prefix}-${String(sequence).padStart(4, '0')}`,
      on_behalf_of: null,
      parent: {
        quote_details: null,
        subscription_details: { metadata: clone(sub.metadata), subscription: sub.id },
        type: 'subscription_details',
      },
      payment_settings: { default_mandate: null, payment_method_options: null, payment_method_types: null },
      payments: { object: 'list', data: [], has_more: false, total_count: 0, url: `/v1/invoice_payments?invoice=${id}` },
      period_end: periodEnd,
      period_start: periodStart,
      post_payment_credit_notes_amount: 0,
      pre_payment_credit_notes_amount: 0,
      receipt_number: null,
      rendering: null,
      shipping_cost: null,
      shipping_details: null,
      starting_balance: 0,
      statement_descriptor: null,
      status: 'open',
      status_transitions: { finalized_at: now, marked_uncollectible_at: null, paid_at: null, voided_at: null },
      subtotal: total,
      subtotal_excluding_tax: total,
      test_clock: null,
      total,
      total_discount_amounts: [],
      total_excluding_tax: total,
      total_pretax_credit_amounts: [],
      total_taxes: [],
      webhooks_delivered_at: now,
    });
    sub.latest_invoice = id;
    this.emit('invoice.created', invoice);
    this.emit('invoice.finalized', invoice);
    return invoice;
  }

  private linkInvoicePayment(invoice: ApiObject, pi: ApiObject): void {
    if (invoice.payments.data.some((p: ApiObject) => p.payment.payment_intent === pi.id)) return;
    invoice.payments.data.push({
      id: newId('inpay', 24),
      object: 'invoice_payment',
      amount_paid: null,
      amount_requested: invoice.amount_remaining,
      created: this.now(),
      currency: invoice.currency,
      invoice: invoice.id,
      is_default: true,
      livemode: false,
      payment: { payment_intent: pi.id, type: 'payment_intent' },
      status: 'open',
      status_transitions: { canceled_at: null, paid_at: null },
    });
    invoice.payments.total_count = invoice.payments.data.length;
  }

  private markInvoicePaid(invoice: ApiObject): void {
    const now = this.now();
    invoice.attempt_count += 1;
    invoice.attempted = true;
    invoice.amount_paid = invoice.amount_due;
    invoice.amount_remaining = 0;
    invoice.status = 'paid';
    invoice.next_payment_attempt = null;
    invoice.status_transitions.paid_at = now;
    for (const p of invoice.payments.data) {
      p.status = 'paid';
      p.amount_paid = invoice.amount_due;
      p.status_transitions.paid_at = now;
    }
    this.emit('invoice.paid', invoice);
    this.emit('invoice.payment_succeeded', invoice);
  }

  /** One collection attempt on an open invoice, with the subscription's card on file. */
  attemptInvoice(invoice: ApiObject): void {
    const sub = this.store.getOf('subscription', invoice.parent?.subscription_details?.subscription);
    const customer = this.store.getOf('customer', invoice.customer);
    if (!sub || !customer || sub.status === 'canceled') {
      invoice.next_payment_attempt = null;
      return;
    }
    const pmId = sub.default_payment_method ?? customer.invoice_settings.default_payment_method;
    const pm = pmId ? this.store.getOf('payment_method', pmId) : undefined;
    let pi = this.store.getOf('payment_intent', invoice.payments.data[0]?.payment?.payment_intent);
    if (!pi) {
      pi = this.newPaymentIntent({
        amount: invoice.amount_remaining,
        currency: invoice.currency,
        customer: customer.id,
        description: 'Subscription update',
        metadata: {},
        receiptEmail: customer.email,
      });
      this.linkInvoicePayment(invoice, pi);
    }
    const failCode = this.store.internal(customer.id).failRenewals;
    const forced = failCode ? declineFor(failCode === 'insufficient_funds' ? 'insufficient_funds' : 'generic_decline') : null;
    const result = pm
      ? this.confirm(pi, pm, forced)
      : {
          ok: false as const,
          decline: {
            code: 'card_declined' as const,
            declineCode: 'generic_decline' as const,
            message: 'The customer has no card on file.',
          },
        };
    if (result.ok) {
      this.markInvoicePaid(invoice);
      if (sub.status !== 'active') {
        const previous = { status: sub.status };
        sub.status = 'active';
        this.emit('customer.subscription.updated', sub, previous);
      }
      return;
    }
    invoice.attempt_count += 1;
    invoice.attempted = true;
    const retriesUsed = invoice.attempt_count - 1;
    const days = this.opts.renewalRetryDays[retriesUsed];
    invoice.next_payment_attempt = days === undefined ? null : this.now() + Math.round(days * DAY);
    this.emit('invoice.payment_failed', invoice);
    if (invoice.next_payment_attempt === null) {
      if (this.opts.subscriptionStatusAfterFailedRetries === 'canceled') this.endSubscription(sub, 'payment_failed');
      else if (sub.status !== 'unpaid') {
        const previous = { status: sub.status };
        sub.status = 'unpaid';
        this.emit('customer.subscription.updated', sub, previous);
      }
    } else if (sub.status === 'active') {
      sub.status = 'past_due';
      this.emit('customer.subscription.updated', sub, { status: 'active' });
    }
  }

  payInvoice(id: string, r: Reader): ApiObject {
    r.rejectUnknown(['payment_method', 'off_session']);
    const invoice = this.find('invoice', id, 'invoice');
    if (invoice.status !== 'open') throw invalid(`Invoice is already ${invoice.status}.`, 'invoice', 'invoice_not_open');
    this.attemptInvoice(invoice);
    if (invoice.status !== 'paid') {
      const pi = this.store.getOf('payment_intent', invoice.payments.data[0]?.payment?.payment_intent);
      const err = pi?.last_payment_error;
      throw new ApiError(402, {
        type: 'card_error',
        code: err?.code ?? 'card_declined',
        decline_code: err?.decline_code ?? 'generic_decline',
        message: err?.message ?? 'Your card was declined.',
        ...(pi ? { payment_intent: clone(pi) } : {}),
      });
    }
    return invoice;
  }

  // ---------- card on file ----------
  createPortalSession(r: Reader): ApiObject {
    r.rejectUnknown(['customer', 'return_url', 'configuration', 'locale', 'flow_data']);
    const customer = this.find('customer', r.str('customer', { required: true }), 'customer', 'customer');
    const returnUrl = r.str('return_url') ?? null;
    if (returnUrl && !/^https?:\/\//.test(returnUrl)) throw invalid('Not a valid URL', 'return_url', 'url_invalid');
    const id = newId('bps', 24);
    return this.store.insert('billing_portal_session', {
      id,
      object: 'billing_portal.session',
      configuration: 'bpc_local_default',
      created: this.now(),
      customer: customer.id,
      flow: null,
      livemode: false,
      locale: null,
      on_behalf_of: null,
      return_url: returnUrl,
      url: `${this.opts.publicBaseUrl()}/billing/${id}`,
    });
  }

  /**
   * A new card from the hosted update page becomes the default on the customer and their live subscriptions,
   * clears a fail-renewals switch (it modelled the old card) and retries their open invoices at once.
   */
  replaceCard(customer: ApiObject, card: CardInput): ApiObject {
    const pm = this.newPaymentMethod(card, customer.id, customer.email);
    pm.billing_details.name = card.name ?? customer.name;
    const previous = { invoice_settings: clone(customer.invoice_settings) };
    customer.invoice_settings.default_payment_method = pm.id;
    delete this.store.internal(customer.id).failRenewals;
    this.emit('payment_method.attached', pm);
    this.emit('customer.updated', customer, previous);
    for (const sub of this.store.all('subscription')) {
      if (sub.customer !== customer.id || sub.status === 'canceled') continue;
      const before = { default_payment_method: sub.default_payment_method };
      sub.default_payment_method = pm.id;
      this.emit('customer.subscription.updated', sub, before);
    }
    for (const invoice of this.store.all('invoice')) {
      if (invoice.customer === customer.id && invoice.status === 'open') this.attemptInvoice(invoice);
    }
    return pm;
  }

  setFailRenewals(customerId: string, fail: boolean, declineCode: string): ApiObject {
    const customer = this.find('customer', customerId, 'customer');
    if (fail) this.store.internal(customer.id).failRenewals = declineCode;
    else delete this.store.internal(customer.id).failRenewals;
    return customer;
  }

  // ---------- payouts ----------
  /** Pays out, per currency, every available balance transaction not yet paid out, when their sum is positive. */
  runPayouts(skewMinor = 0): ApiObject[] {
    this.refreshBalance();
    const now = this.now();
    this.store.state.lastPayoutRunAt = now;
    const groups = new Map<string, ApiObject[]>();
    for (const txn of this.store.all('balance_transaction')) {
      if (txn.type === 'payout' || txn.status !== 'available' || this.store.internal(txn.id).payout) continue;
      const list = groups.get(txn.currency) ?? [];
      list.push(txn);
      groups.set(txn.currency, list);
    }
    const payouts: ApiObject[] = [];
    for (const [currency, txns] of groups) {
      const contained = txns.reduce((sum, t) => sum + (t.net as number), 0);
      if (contained <= 0) continue;
      // A skew (fault switch) makes the payout differ from what it contains, as a bank-side error would.
      const amount = contained + skewMinor;
      const id = newId('po', 24);
      const own = this.newBalanceTransaction({
        amount: -amount,
        currency,
        fee: 0,
        feeDescription: '',
        source: id,
        type: 'payout',
        reportingCategory: 'payout',
        availableOn: now,
        description: 'LOCAL TEST PAYOUT',
      });
      for (const t of [...txns, own]) this.store.internal(t.id).payout = id;
      const payout = this.store.insert('payout', {
        id,
        object: 'payout',
        amount,
        application_fee: null,
        application_fee_amount: null,
        arrival_date: now,
        automatic: true,
        balance_transaction: own.id,
        created: now,
        currency,
        description: 'LOCAL TEST PAYOUT',
        destination: 'ba_local_test_account',
        failure_balance_transaction: null,
        failure_code: null,
        failure_message: null,
        livemode: false,
        metadata: {},
        method: 'standard',
        original_payout: null,
        reconciliation_status: 'completed',
        reversed_by: null,
        source_type: 'card',
        statement_descriptor: null,
        status: 'pending',
        trace_id: null,
        type: 'bank_account',
      });
      this.emit('payout.created', payout);
      payout.status = 'paid';
      this.emit('payout.paid', payout, { status: 'pending' });
      payouts.push(payout);
    }
    return payouts;
  }

  subscriptionItemsList(sub: ApiObject): ApiObject {
    return listOf(sub.items.data, `/v1/subscription_items?subscription=${sub.id}`);
  }
}
