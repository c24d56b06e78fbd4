// Loopback stand-in for the payment processor's REST API (v1, form-encoded), its hosted checkout and
// card-update pages, signed webhooks, a fake clock and fault switches. See README.md in this folder.
import { createHash } from 'node:crypto';
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import { declineFor, defaultFeeSchedule, type FeeSchedule } from './cards';
import { API_VERSION, clone, Engine } from './engine';
import { checkoutPage, messagePage, portalPage, readCardForm, type CardForm } from './pages';
import { ApiError, decodeForm, invalid, noSuch, Reader, type Params } from './params';
import { newId, Store, type ApiObject, type CollectionName, type State } from './store';
import { defaultRetryDelaysMs, WebhookSender, type FlushResult } from './webhooks';

export interface PaymentsFakeOptions {
  /** 0 = a free port. */
  port?: number;
  /** JSON file holding the state; loaded at start, rewritten after each change. Omit for memory only. */
  statePath?: string;
  /** Where events are POSTed; omit to record events without delivering them. */
  webhookUrl?: string;
  webhookSecret: string;
  /** When set, API calls must carry `Authorization: Bearer <apiKey>`. */
  apiKey?: string;
  /** Base of the hosted page URLs handed out (default http://127.0.0.1:<port>). */
  publicBaseUrl?: string;
  /** Request and webhook lines on stdout. */
  log?: boolean;
  webhookRetryDelaysMs?: readonly number[];
  webhookTimeoutMs?: number;
  /** Default [3, 5, 7]: days after each failed renewal attempt before the next. */
  renewalRetryDays?: readonly number[];
  subscriptionStatusAfterFailedRetries?: 'canceled' | 'unpaid';
  fees?: FeeSchedule;
  /** Default 2 days. */
  availableAfterSeconds?: number;
  disputeFeeMinor?: number;
  /** Daily automatic payouts on the fake clock (default true). */
  autoPayouts?: boolean;
}

export interface Faults {
  latencyMs: number;
  /** 0..1: share of API calls answered with a 500. */
  failRate: number;
  /** The next n API calls are answered with a 500. */
  failNext: number;
  /** Events are recorded but never delivered. */
  dropWebhooks: boolean;
  /** Added to the amount of the next payout run (then back to 0): a payout that does not sum. */
  payoutSkewMinor: number;
}

export interface PaymentsFake {
  url: string;
  port: number;
  close(): Promise<void>;
  clock: { now(): number; advance(seconds: number): Promise<number> };
  faults: { get(): Faults; set(update: Partial<Faults>): Faults; reset(): Faults };
  webhooks: { flush(): Promise<FlushResult>; deliveries(): State['deliveries']; redeliver(eventId: string): void };
  payouts: { run(): ApiObject[] };
  disputes: { close(disputeId: string, outcome: 'won' | 'lost'): ApiObject };
  /** Direct seeding for benchmarks: charges with their balance transactions, no events. */
  seed: {
    charges(count: number, opts?: { amountMinor?: number; currency?: string }): { chargeId: string; balanceTransactionId: string }[];
  };
  customers: { failRenewals(customerId: string, fail?: boolean, declineCode?: 'generic_decline' | 'insufficient_funds'): void };
  state(): State;
  reset(): void;
}

const noFaults = (): Faults => ({ latencyMs: 0, failRate: 0, failNext: 0, dropWebhooks: false, payoutSkewMinor: 0 });
const IDEMPOTENCY_TTL_MS = 24 * 3600 * 1000;
const MAX_BODY_BYTES = 1024 * 1024;
/** The processor keeps events for 30 days. */
const EVENT_RETENTION_SECONDS = 30 * 86_400;

class HttpError extends Error {
  constructor(
    readonly status: number,
    message: string,
  ) {
    super(message);
  }
}

function readBody(req: http.IncomingMessage): Promise<string> {
  return new Promise((resolve, reject) => {
    const chunks: Buffer[] = [];
    let size = 0;
    req.on('data', (c: Buffer) => {
      size += c.length;
      if (size > MAX_BODY_BYTES) {
        reject(new HttpError(413, 'request body too large'));
        req.destroy();
        return;
      }
      chunks.push(c);
    });
    req.on('end', () => resolve(Buffer.concat(chunks).toString('utf8')));
    req.on('error', reject);
  });
}

function canonical(value: unknown): string {
  if (Array.isArray(value)) return `[${value.map(canonical).join(',')}]`;
  if (value && typeof value === 'object') {
    return `{${Object.keys(value)
      .sort()
      .map((k) => `${JSON.stringify(k)}:${canonical((value as Record<string, unknown>)[k])}`)
      .join(',')}}`;
  }
  return JSON.stringify(value);
}

type Route = {
  method: string;
  pattern: RegExp;
  mutates: boolean;
  handle: (m: string[], r: Reader) => ApiObject;
};

export async function createPaymentsFake(opts: PaymentsFakeOptions): Promise<PaymentsFake> {
  if (!opts.webhookSecret) throw new Error('payments fake: webhookSecret is required');
  const store = new Store(opts.statePath);
  const say = (line: string) => {
    if (opts.log) console.log(`[payments-fake] ${line}`);
  };
  let faults = noFaults();
  let publicBaseUrl = opts.publicBaseUrl?.replace(/\/$/, '') ?? '';
  const webhooks = new WebhookSender(store, {
    url: opts.webhookUrl,
    secret: opts.webhookSecret,
    retryDelaysMs: opts.webhookRetryDelaysMs ?? defaultRetryDelaysMs,
    timeoutMs: opts.webhookTimeoutMs ?? 10_000,
    log: say,
  });
  const engine = new Engine(store, webhooks, {
    publicBaseUrl: () => publicBaseUrl,
    fees: opts.fees ?? defaultFeeSchedule,
    renewalRetryDays: opts.renewalRetryDays ?? [3, 5, 7],
    subscriptionStatusAfterFailedRetries: opts.subscriptionStatusAfterFailedRetries ?? 'canceled',
    availableAfterSeconds: opts.availableAfterSeconds ?? 2 * 86_400,
    disputeFeeMinor: opts.disputeFeeMinor ?? 1500,
    autoPayouts: opts.autoPayouts ?? true,
    checkoutExpirySeconds: 86_400,
    dropWebhooks: () => faults.dropWebhooks,
  });

  const persist = () => {
    const cutoff = Date.now() - IDEMPOTENCY_TTL_MS;
    for (const [k, rec] of Object.entries(store.state.idempotency)) if (rec.createdMs < cutoff) delete store.state.idempotency[k];
    store.pruneEvents(engine.now() - EVENT_RETENTION_SECONDS);
    store.markDirty();
  };

  // ---------- lists and expansion ----------
  const list = (name: CollectionName, r: Reader, url: string, filter: (o: ApiObject) => boolean = () => true): ApiObject => {
    const limit = r.int('limit', { min: 1, max: 100 }) ?? 10;
    let inRange: (o: ApiObject) => boolean = () => true;
    const created = r.params.created;
    if (created !== undefined) {
      if (typeof created === 'string') inRange = (o) => o.created === Number(created);
      else {
        const c = new Reader(created as Params, 'created');
        const gt = c.int('gt');
        const gte = c.int('gte');
        const lt = c.int('lt');
        const lte = c.int('lte');
        inRange = (o) =>
          (gt === undefined || o.created > gt) &&
          (gte === undefined || o.created >= gte) &&
          (lt === undefined || o.created < lt) &&
          (lte === undefined || o.created <= lte);
      }
    }
    const matches = (o: ApiObject) => filter(o) && inRange(o);
    const all = store.all(name); // oldest first; the processor lists newest first
    const after = r.str('starting_after');
    const before = r.str('ending_before');
    if (before) {
      const items = all.filter(matches).reverse();
      const i = items.findIndex((o) => o.id === before);
      if (i < 0) throw noSuch('object', before, 'ending_before');
      const rest = items.slice(0, i);
      return {
        object: 'list',
        data: rest.slice(Math.max(0, rest.length - limit)),
        has_more: rest.length > limit,
        url,
      } as unknown as ApiObject;
    }
    // Walks back from the cursor and stops after one item past the page, so paging through a large collection
    // costs each page its own length, not the whole collection (the benchmark pages through 100k).
    let from = all.length - 1;
    if (after) {
      const cursor = store.get(after);
      const i = cursor && matches(cursor) ? all.lastIndexOf(cursor) : -1;
      if (i < 0) throw noSuch('object', after, 'starting_after');
      from = i - 1;
    }
    const page: ApiObject[] = [];
    let hasMore = false;
    for (let i = from; i >= 0; i--) {
      const o = all[i]!;
      if (!matches(o)) continue;
      if (page.length === limit) {
        hasMore = true;
        break;
      }
      page.push(o);
    }
    return { object: 'list', data: page, has_more: hasMore, url } as unknown as ApiObject;
  };

  const virtualField = (node: ApiObject, field: string): unknown => {
    if (node.object === 'checkout.session' && field === 'line_items') {
      const data = engine.sessionLineItems(node.id);
      return { object: 'list', data, has_more: false, url: `/v1/checkout/sessions/${node.id}/line_items` };
    }
    if (node.object === 'charge' && field === 'refunds') {
      const data = store
        .all('refund')
        .filter((re) => re.charge === node.id)
        .reverse();
      return { object: 'list', data, has_more: false, total_count: data.length, url: `/v1/charges/${node.id}/refunds` };
    }
    return undefined;
  };

  const expandPath = (node: unknown, segments: string[], full: string, depth: number): void => {
    if (!node || typeof node !== 'object' || segments.length === 0) return;
    if (Array.isArray(node)) {
      for (const el of node) expandPath(el, segments, full, depth);
      return;
    }
    const obj = node as ApiObject;
    const [head, ...rest] = segments as [string, ...string[]];
    let value = obj[head];
    if (value === undefined) {
      value = virtualField(obj, head);
      if (value === undefined) throw invalid(`This property cannot be expanded (${full}).`, 'expand');
      obj[head] = clone(value);
    } else if (typeof value === 'string') {
      const target = store.get(value);
      if (target) obj[head] = clone(target);
    }
    if (depth >= 4) throw invalid(`You cannot expand more than 4 levels of a property (${full}).`, 'expand');
    expandPath(obj[head], rest, full, depth + 1);
  };

  const render = (obj: ApiObject, r: Reader): ApiObject => {
    const out = clone(obj);
    for (const path of r.strings('expand') ?? []) expandPath(out, path.split('.'), path, 1);
    return out;
  };

  const eq = (r: Reader, key: string, field = key) => {
    const v = r.str(key);
    return (o: ApiObject) => v === undefined || o[field] === v;
  };
  const all =
    (...fs: Array<(o: ApiObject) => boolean>) =>
    (o: ApiObject) =>
      fs.every((f) => f(o));

  // ---------- routes ----------
  const id = '([A-Za-z0-9_]+)';
  const routes: Route[] = [];
  const route = (method: string, path: string, handle: Route['handle']) =>
    routes.push({ method, pattern: new RegExp(`^${path.replaceAll(':id', id)}$`), mutates: method !== 'GET', handle });

  route('POST', '/v1/customers', (_m, r) => engine.createCustomer(r));
  route('GET', '/v1/customers', (_m, r) => list('customer', r, '/v1/customers', eq(r, 'email')));
  route('GET', '/v1/customers/:id', (m) => engine.find('customer', m[1], 'customer'));
  route('POST', '/v1/customers/:id', (m, r) => engine.updateCustomer(m[1]!, r));
  route('DELETE', '/v1/customers/:id', (m) => engine.deleteCustomer(m[1]!));
  route('GET', '/v1/customers/:id/payment_methods', (m, r) => {
    engine.find('customer', m[1], 'customer');
    return list('payment_method', r, `/v1/customers/${m[1]}/payment_methods`, (o) => o.customer === m[1]);
  });

  route('POST', '/v1/products', (_m, r) => engine.createProduct(r));
  route('GET', '/v1/products', (_m, r) => {
    const active = r.bool('active');
    const ids = r.strings('ids');
    return list('product', r, '/v1/products', (o) => (active === undefined || o.active === active) && (!ids || ids.includes(o.id)));
  });
  route('GET', '/v1/products/:id', (m) => engine.find('product', m[1], 'product'));
  route('POST', '/v1/products/:id', (m, r) => engine.updateProduct(m[1]!, r));

  route('POST', '/v1/prices', (_m, r) => engine.createPrice(r));
  route('GET', '/v1/prices', (_m, r) => {
    const active = r.bool('active');
    const keys = r.strings('lookup_keys');
    const interval = r.obj('recurring')?.str('interval');
    return list(
      'price',
      r,
      '/v1/prices',
      all(
        eq(r, 'product'),
        eq(r, 'type'),
        eq(r, 'currency'),
        (o) =>
          (active === undefined || o.active === active) &&
          (!keys || keys.includes(o.lookup_key)) &&
          (!interval || o.recurring?.interval === interval),
      ),
    );
  });
  route('GET', '/v1/prices/:id', (m) => engine.find('price', m[1], 'price'));
  route('POST', '/v1/prices/:id', (m, r) => engine.updatePrice(m[1]!, r));

  route('POST', '/v1/checkout/sessions', (_m, r) => engine.createCheckoutSession(r));
  route('GET', '/v1/checkout/sessions', (_m, r) =>
    list(
      'checkout_session',
      r,
      '/v1/checkout/sessions',
      all(eq(r, 'customer'), eq(r, 'payment_intent'), eq(r, 'subscription'), eq(r, 'status')),
    ),
  );
  route('GET', '/v1/checkout/sessions/:id', (m) => engine.find('checkout_session', m[1], 'checkout session'));
  route('POST', '/v1/checkout/sessions/:id/expire', (m) => engine.expireSession(engine.find('checkout_session', m[1], 'checkout session')));
  route('GET', '/v1/checkout/sessions/:id/line_items', (m, r) => {
    const data = engine.sessionLineItems(m[1]!);
    const limit = r.int('limit', { min: 1, max: 100 }) ?? 10;
    const after = r.str('starting_after');
    const start = after ? data.findIndex((li) => li.id === after) + 1 : 0;
    return {
      object: 'list',
      data: data.slice(start, start + limit),
      has_more: data.length > start + limit,
      url: `/v1/checkout/sessions/${m[1]}/line_items`,
    } as unknown as ApiObject;
  });

  route('POST', '/v1/payment_intents', (_m, r) => engine.createPaymentIntent(r));
  route('GET', '/v1/payment_intents', (_m, r) => list('payment_intent', r, '/v1/payment_intents', eq(r, 'customer')));
  route('GET', '/v1/payment_intents/:id', (m) => engine.find('payment_intent', m[1], 'payment_intent'));
  route('POST', '/v1/payment_intents/:id', (m, r) => engine.updatePaymentIntent(m[1]!, r));
  route('POST', '/v1/payment_intents/:id/confirm', (m, r) => engine.confirmPaymentIntent(m[1]!, r));
  route('POST', '/v1/payment_intents/:id/cancel', (m, r) => engine.cancelPaymentIntent(m[1]!, r));

  route('GET', '/v1/payment_methods', (_m, r) => list('payment_method', r, '/v1/payment_methods', eq(r, 'customer')));
  route('GET', '/v1/payment_methods/:id', (m) => engine.find('payment_method', m[1], 'PaymentMethod'));

  route('GET', '/v1/charges', (_m, r) => list('charge', r, '/v1/charges', all(eq(r, 'customer'), eq(r, 'payment_intent'))));
  route('GET', '/v1/charges/:id', (m) => engine.find('charge', m[1], 'charge'));
  route('POST', '/v1/charges/:id', (m, r) => engine.updateCharge(m[1]!, r));

  route('POST', '/v1/refunds', (_m, r) => engine.createRefund(r));
  route('GET', '/v1/refunds', (_m, r) => list('refund', r, '/v1/refunds', all(eq(r, 'charge'), eq(r, 'payment_intent'))));
  route('GET', '/v1/refunds/:id', (m) => engine.find('refund', m[1], 'refund'));

  route('GET', '/v1/disputes', (_m, r) => list('dispute', r, '/v1/disputes', all(eq(r, 'charge'), eq(r, 'payment_intent'))));
  route('GET', '/v1/disputes/:id', (m) => engine.find('dispute', m[1], 'dispute'));

  route('GET', '/v1/subscriptions', (_m, r) => {
    const status = r.str('status', {
      oneOf: ['active', 'past_due', 'unpaid', 'canceled', 'incomplete', 'incomplete_expired', 'trialing', 'paused', 'all', 'ended'],
    });
    const price = r.str('price');
    return list(
      'subscription',
      r,
      '/v1/subscriptions',
      all(eq(r, 'customer'), (o) => {
        const statusOk =
          status === 'all' ? true : status === 'ended' ? o.status === 'canceled' : status ? o.status === status : o.status !== 'canceled';
        return statusOk && (!price || o.items.data.some((i: ApiObject) => i.price.id === price));
      }),
    );
  });
  route('GET', '/v1/subscriptions/:id', (m) => engine.find('subscription', m[1], 'subscription'));
  route('POST', '/v1/subscriptions/:id', (m, r) => engine.updateSubscription(m[1]!, r));
  route('DELETE', '/v1/subscriptions/:id', (m, r) => engine.cancelSubscription(m[1]!, r));
  route('GET', '/v1/subscription_items', (_m, r) =>
    engine.subscriptionItemsList(engine.find('subscription', r.str('subscription', { required: true }), 'subscription', 'subscription')),
  );

  route('GET', '/v1/invoices', (_m, r) =>
    list(
      'invoice',
      r,
      '/v1/invoices',
      all(
        eq(r, 'customer'),
        eq(r, 'status'),
        (o) => !r.has('subscription') || o.parent?.subscription_details?.subscription === r.str('subscription'),
      ),
    ),
  );
  route('GET', '/v1/invoices/:id', (m) => engine.find('invoice', m[1], 'invoice'));
  route('POST', '/v1/invoices/:id/pay', (m, r) => engine.payInvoice(m[1]!, r));

  route('GET', '/v1/balance', () => engine.balance());
  route('GET', '/v1/balance_transactions', (_m, r) => {
    const payout = r.str('payout');
    return list(
      'balance_transaction',
      r,
      '/v1/balance_transactions',
      all(eq(r, 'source'), eq(r, 'type'), eq(r, 'currency'), (o) => !payout || store.internal(o.id).payout === payout),
    );
  });
  route('GET', '/v1/balance_transactions/:id', (m) => engine.find('balance_transaction', m[1], 'balance transaction'));

  route('GET', '/v1/payouts', (_m, r) => list('payout', r, '/v1/payouts', eq(r, 'status')));
  route('GET', '/v1/payouts/:id', (m) => engine.find('payout', m[1], 'payout'));

  route('POST', '/v1/billing_portal/sessions', (_m, r) => engine.createPortalSession(r));

  route('GET', '/v1/events', (_m, r) => {
    const type = r.str('type');
    const types = r.strings('types');
    const match = (t: string, pattern: string) => (pattern.endsWith('*') ? t.startsWith(pattern.slice(0, -1)) : t === pattern);
    return list('event', r, '/v1/events', (o) => (!type || match(o.type, type)) && (!types || types.some((p) => match(o.type, p))));
  });
  route('GET', '/v1/events/:id', (m) => engine.find('event', m[1], 'event'));

  // ---------- API dispatch ----------
  const sendJson = (res: http.ServerResponse, status: number, body: unknown, headers: Record<string, string> = {}) => {
    const text = typeof body === 'string' ? body : JSON.stringify(body);
    res.writeHead(status, { 'content-type': 'application/json', 'stripe-version': API_VERSION, ...headers });
    res.end(text);
  };
  const sendHtml = (res: http.ServerResponse, status: number, html: string) => {
    res.writeHead(status, { 'content-type': 'text/html; charset=utf-8', 'cache-control': 'no-store' });
    res.end(html);
  };
  const redirect = (res: http.ServerResponse, location: string) => {
    res.writeHead(303, { location });
    res.end();
  };

  const handleApi = async (req: http.IncomingMessage, res: http.ServerResponse, url: URL, rawBody: string, requestId: string) => {
    if (faults.latencyMs > 0) await new Promise((r) => setTimeout(r, faults.latencyMs));
    if (faults.failNext > 0 || (faults.failRate > 0 && Math.random() < faults.failRate)) {
      if (faults.failNext > 0) faults.failNext -= 1;
      sendJson(res, 500, {
        error: { type: 'api_error', message: 'An unknown error occurred (fault injected by the local payments fake).' },
      });
      return;
    }
    const auth = req.headers.authorization ?? '';
    const key = auth.startsWith('Bearer ') ? auth.slice(7).trim() : '';
    if (!key) {
      sendJson(res, 401, {
        error: {
          type: 'invalid_request_error',
          message: 'You did not provide an API key. Provide it in the Authorization header (Bearer <key>).',
        },
      });
      return;
    }
    if (opts.apiKey && key !== opts.apiKey) {
      sendJson(res, 401, {
        error: {
          type: 'invalid_request_error',
          code: 'api_key_invalid',
          message: `Invalid API Key provided: ${key.length > 12 ? `${key.slice(0, 8)}****${key.slice(-4)}` : '****'}`,
        },
      });
      return;
    }
    const method = req.method ?? 'GET';
    const params = method === 'POST' ? decodeForm(rawBody) : decodeForm(url.search.slice(1));
    const idemKey = method === 'POST' ? (req.headers['idempotency-key'] as string | undefined) : undefined;
    const paramsHash = createHash('sha256').update(canonical(params)).digest('hex');
    if (idemKey) {
      const prior = store.state.idempotency[idemKey];
      if (prior) {
        if (prior.method !== method || prior.path !== url.pathname) {
          throw new ApiError(400, {
            type: 'idempotency_error',
            message: `Keys for idempotent requests can only be used for the same endpoint they were first used for ('${prior.method} ${prior.path}' vs '${method} ${url.pathname}'). Try using a key other than '${idemKey}' if you meant to execute a different request.`,
          });
        }
        if (prior.paramsHash !== paramsHash) {
          throw new ApiError(400, {
            type: 'idempotency_error',
            message: `Keys for idempotent requests can only be used with the same parameters they were first used with. Try using a key other than '${idemKey}' if you meant to execute a different request.`,
          });
        }
        sendJson(res, prior.status, prior.body, { 'idempotent-replayed': 'true', 'idempotency-key': idemKey });
        return;
      }
    }
    const match = routes
      .filter((r) => r.method === method)
      .map((r) => ({ r, m: url.pathname.match(r.pattern) }))
      .find((x) => x.m);
    if (!match) {
      const known = routes.some((r) => r.pattern.test(url.pathname));
      throw new ApiError(404, {
        type: 'invalid_request_error',
        message: known
          ? `Unrecognized request URL (${method}: ${url.pathname}). This method is not allowed here.`
          : `Unrecognized request URL (${method}: ${url.pathname}).`,
      });
    }
    engine.ctx = { requestId, idempotencyKey: idemKey ?? null };
    const tasksRun = engine.processDue();
    const reader = new Reader(params);
    let status = 200;
    let text: string;
    try {
      text = JSON.stringify(render(match.r.handle(match.m!, reader), reader));
    } catch (err) {
      if (!(err instanceof ApiError)) throw err;
      status = err.status;
      text = JSON.stringify({ error: { ...err.body, request_log_url: null } });
    } finally {
      engine.ctx = { requestId: null, idempotencyKey: null };
    }
    // As the processor does, results are kept for replay once the endpoint ran (success or card decline).
    if (idemKey && (status < 300 || status === 402)) {
      store.state.idempotency[idemKey] = { method, path: url.pathname, paramsHash, status, body: text, createdMs: Date.now() };
    }
    if (match.r.mutates || tasksRun > 0) {
      persist();
      webhooks.kick();
    }
    sendJson(res, status, text, idemKey ? { 'idempotency-key': idemKey } : {});
  };

  // ---------- hosted pages ----------
  const handleCheckoutPage = async (req: http.IncomingMessage, res: http.ServerResponse, sessionId: string, rawBody: string) => {
    engine.processDue();
    const session = store.getOf('checkout_session', sessionId);
    if (!session) return sendHtml(res, 404, messagePage('Checkout not found', 'This checkout link does not exist.'));
    if (session.status === 'complete') {
      return sendHtml(
        res,
        200,
        messagePage('Already paid', 'This checkout is complete.', {
          href: String(session.success_url).replaceAll('{CHECKOUT_SESSION_ID}', session.id),
          text: 'Continue',
        }),
      );
    }
    if (session.status === 'expired') {
      return sendHtml(
        res,
        410,
        messagePage(
          'Checkout expired',
          'This checkout link has expired.',
          session.cancel_url ? { href: session.cancel_url, text: 'Go back' } : undefined,
        ),
      );
    }
    const lineItems = engine.sessionLineItems(session.id);
    const description = engine.sessionDescription(session.id);
    if (req.method === 'GET') return sendHtml(res, 200, checkoutPage(session, lineItems, {}, {}, description));
    const form = Object.fromEntries(new URLSearchParams(rawBody)) as CardForm;
    const keep: CardForm = { email: form.email, name: form.name, expiry: form.expiry };
    const read = readCardForm(form, engine.now(), {
      emailRequired: session.mode === 'subscription' && !session.customer && !session.customer_email,
    });
    if ('errors' in read)
      return sendHtml(res, 400, checkoutPage(session, lineItems, { ...keep, card_number: form.card_number }, read.errors, description));
    const result = engine.payCheckoutSession(session, read.card);
    persist();
    webhooks.kick();
    if (result.ok) return redirect(res, result.redirectUrl);
    const reason =
      result.decline.declineCode === 'insufficient_funds'
        ? 'Your card has insufficient funds. Try another card.'
        : 'Your card was declined. Try another card.';
    return sendHtml(res, 402, checkoutPage(session, lineItems, keep, { form: reason }, description));
  };

  const handlePortalPage = async (req: http.IncomingMessage, res: http.ServerResponse, portalId: string, rawBody: string) => {
    engine.processDue();
    const portal = store.getOf('billing_portal_session', portalId);
    const customer = portal ? store.getOf('customer', portal.customer) : undefined;
    if (!portal || !customer) return sendHtml(res, 404, messagePage('Link not found', 'This card update link does not exist.'));
    const current = () => store.getOf('payment_method', customer.invoice_settings.default_payment_method ?? '');
    const openInvoices = () => store.all('invoice').filter((inv) => inv.customer === customer.id && inv.status === 'open');
    if (req.method === 'GET') return sendHtml(res, 200, portalPage(portal, customer, current(), openInvoices(), {}, {}));
    const form = Object.fromEntries(new URLSearchParams(rawBody)) as CardForm;
    const keep: CardForm = { name: form.name, expiry: form.expiry };
    const read = readCardForm(form, engine.now(), { emailRequired: false });
    if ('errors' in read)
      return sendHtml(
        res,
        400,
        portalPage(portal, customer, current(), openInvoices(), { ...keep, card_number: form.card_number }, read.errors),
      );
    const decline = read.card.behaviour === 'attach_then_decline' ? null : declineFor(read.card.behaviour);
    if (decline)
      return sendHtml(
        res,
        402,
        portalPage(portal, customer, current(), openInvoices(), keep, { form: `${decline.message} The card was not saved.` }),
      );
    engine.replaceCard(customer, read.card);
    persist();
    webhooks.kick();
    if (portal.return_url) return redirect(res, portal.return_url);
    return sendHtml(res, 200, portalPage(portal, customer, current(), openInvoices(), {}, {}, 'Card saved.'));
  };

  // ---------- test controls ----------
  const handleControl = async (req: http.IncomingMessage, res: http.ServerResponse, url: URL, rawBody: string) => {
    let body: Record<string, unknown> = {};
    if (rawBody.trim()) {
      try {
        body = JSON.parse(rawBody) as Record<string, unknown>;
      } catch {
        throw new HttpError(400, 'body must be JSON');
      }
    }
    const method = req.method ?? 'GET';
    const p = url.pathname;
    let m: RegExpMatchArray | null;
    const done = (value: unknown) => {
      persist();
      webhooks.kick();
      sendJson(res, 200, value);
    };
    if (method === 'GET' && p === '/_fake/state') return sendJson(res, 200, store.state);
    if (method === 'POST' && p === '/_fake/reset') {
      store.reset();
      store.state.lastPayoutRunAt = engine.now();
      faults = noFaults();
      return done({ ok: true });
    }
    if (method === 'GET' && p === '/_fake/clock') return sendJson(res, 200, { now: engine.now() });
    if (method === 'POST' && p === '/_fake/clock/advance') {
      const seconds = Number(body.seconds ?? 0) + Number(body.days ?? 0) * 86_400;
      if (!Number.isFinite(seconds) || seconds < 0) throw new HttpError(400, 'seconds (or days) must be a non-negative number');
      return done({ now: engine.advance(seconds) });
    }
    if (p === '/_fake/faults') {
      if (method === 'GET') return sendJson(res, 200, faults);
      if (method === 'DELETE') return sendJson(res, 200, (faults = noFaults()));
      if (method === 'POST') return sendJson(res, 200, setFaults(body));
    }
    if (method === 'POST' && p === '/_fake/webhooks/flush') return sendJson(res, 200, await webhooks.flush());
    if (method === 'GET' && p === '/_fake/webhooks') return sendJson(res, 200, store.state.deliveries);
    if (method === 'POST' && p === '/_fake/webhooks/redeliver') {
      const eventId = String(body.eventId ?? '');
      if (!store.getOf('event', eventId)) throw new HttpError(404, `no event ${eventId}`);
      webhooks.redeliver(eventId);
      return sendJson(res, 200, { ok: true });
    }
    if (method === 'POST' && p === '/_fake/payouts/run') return done({ payouts: runPayouts() });
    if (method === 'POST' && (m = p.match(/^\/_fake\/disputes\/([A-Za-z0-9_]+)\/close$/))) {
      const outcome = String(body.outcome ?? '');
      if (outcome !== 'won' && outcome !== 'lost') throw new HttpError(400, 'outcome must be won or lost');
      return done(engine.closeDispute(engine.find('dispute', m[1], 'dispute'), outcome));
    }
    if (method === 'POST' && p === '/_fake/seed/charges') {
      const count = Number(body.count);
      if (!Number.isInteger(count) || count < 1 || count > 1_000_000)
        throw new HttpError(400, 'count must be an integer from 1 to 1000000');
      return done({
        charges: engine.seedCharges(count, { amountMinor: Number(body.amountMinor ?? 2500), currency: String(body.currency ?? 'usd') }),
      });
    }
    if (method === 'POST' && (m = p.match(/^\/_fake\/customers\/([A-Za-z0-9_]+)\/fail-renewals$/))) {
      const code = String(body.declineCode ?? 'generic_decline');
      if (code !== 'generic_decline' && code !== 'insufficient_funds')
        throw new HttpError(400, 'declineCode must be generic_decline or insufficient_funds');
      return done(engine.setFailRenewals(m[1]!, body.fail !== false, code));
    }
    if (method === 'POST' && (m = p.match(/^\/_fake\/charges\/([A-Za-z0-9_]+)\/dispute$/))) {
      const charge = engine.find('charge', m[1], 'charge');
      return done(engine.openDispute(charge, String(body.reason ?? 'fraudulent')));
    }
    if (method === 'POST' && (m = p.match(/^\/_fake\/checkout\/sessions\/([A-Za-z0-9_]+)\/pay$/))) {
      const session = engine.find('checkout_session', m[1], 'checkout session');
      const form = { expiry: '12 / 40', cvc: '123', ...body } as CardForm;
      const read = readCardForm(form, engine.now(), { emailRequired: false });
      if ('errors' in read) throw new HttpError(400, Object.values(read.errors).join(' '));
      const result = engine.payCheckoutSession(session, read.card);
      return done(result.ok ? { ok: true, redirectUrl: result.redirectUrl } : { ok: false, decline: result.decline });
    }
    throw new HttpError(404, `unknown control ${method} ${p}`);
  };

  const runPayouts = () => {
    const skew = faults.payoutSkewMinor;
    faults.payoutSkewMinor = 0;
    return engine.runPayouts(skew);
  };

  const setFaults = (update: Partial<Record<keyof Faults, unknown>>): Faults => {
    const next = { ...faults };
    if (update.latencyMs !== undefined) next.latencyMs = Math.max(0, Number(update.latencyMs) || 0);
    if (update.failRate !== undefined) next.failRate = Math.min(1, Math.max(0, Number(update.failRate) || 0));
    if (update.failNext !== undefined) next.failNext = Math.max(0, Math.floor(Number(update.failNext) || 0));
    if (update.dropWebhooks !== undefined) next.dropWebhooks = update.dropWebhooks === true;
    if (update.payoutSkewMinor !== undefined) next.payoutSkewMinor = Math.trunc(Number(update.payoutSkewMinor) || 0);
    faults = next;
    return { ...faults };
  };

  // ---------- server ----------
  const server = http.createServer((req, res) => {
    const requestId = newId('req', 14);
    res.setHeader('request-id', requestId);
    const started = Date.now();
    res.on('finish', () => say(`${req.method} ${req.url} → ${res.statusCode} (${Date.now() - started} ms)`));
    void (async () => {
      const url = new URL(req.url ?? '/', 'http://127.0.0.1');
      try {
        const rawBody = req.method === 'GET' || req.method === 'HEAD' ? '' : await readBody(req);
        if (url.pathname.startsWith('/v1/')) return await handleApi(req, res, url, rawBody, requestId);
        if (url.pathname.startsWith('/_fake/')) return await handleControl(req, res, url, rawBody);
        let m: RegExpMatchArray | null;
        if ((m = url.pathname.match(/^\/pay\/([A-Za-z0-9_]+)$/)) && (req.method === 'GET' || req.method === 'POST'))
          return await handleCheckoutPage(req, res, m[1]!, rawBody);
        if ((m = url.pathname.match(/^\/billing\/([A-Za-z0-9_]+)$/)) && (req.method === 'GET' || req.method === 'POST'))
          return await handlePortalPage(req, res, m[1]!, rawBody);
        if (url.pathname === '/' || url.pathname === '/healthz')
          return sendJson(res, 200, { ok: true, service: 'payments-fake', apiVersion: API_VERSION });
        sendJson(res, 404, {
          error: { type: 'invalid_request_error', message: `Unrecognized request URL (${req.method}: ${url.pathname}).` },
        });
      } catch (err) {
        if (res.headersSent) return;
        if (err instanceof ApiError) return sendJson(res, err.status, { error: err.body });
        if (err instanceof HttpError) return sendJson(res, err.status, { error: { type: 'invalid_request_error', message: err.message } });
        process.stderr.write(`[payments-fake] internal error on ${req.method} ${url.pathname}: ${(err as Error).stack ?? String(err)}\n`);
        sendJson(res, 500, { error: { type: 'api_error', message: 'An internal error occurred in the local payments fake.' } });
      }
    })();
  });

  await new Promise<void>((resolve, reject) => {
    server.once('error', (err: NodeJS.ErrnoException) =>
      reject(new Error(err.code === 'EADDRINUSE' ? `payments fake: port ${opts.port} is already in use` : `payments fake: ${err.message}`)),
    );
    server.listen(opts.port ?? 0, '127.0.0.1', () => resolve());
  });
  const port = (server.address() as AddressInfo).port;
  const url = `http://127.0.0.1:${port}`;
  if (!publicBaseUrl) publicBaseUrl = url;
  engine.processDue();
  persist();
  webhooks.kick();
  say(`listening on ${url}${opts.webhookUrl ? `, webhooks → ${opts.webhookUrl}` : ''}`);

  let closed = false;
  return {
    url,
    port,
    async close() {
      if (closed) return;
      closed = true;
      await webhooks.close();
      persist();
      store.close();
      await new Promise<void>((resolve) => {
        server.close(() => resolve());
        server.closeAllConnections();
      });
    },
    clock: {
      now: () => engine.now(),
      async advance(seconds: number) {
        const now = engine.advance(seconds);
        persist();
        webhooks.kick();
        return now;
      },
    },
    faults: {
      get: () => ({ ...faults }),
      set: (update) => setFaults(update),
      reset: () => ({ ...(faults = noFaults()) }),
    },
    webhooks: {
      flush: () => webhooks.flush(),
      deliveries: () => clone(store.state.deliveries),
      redeliver: (eventId) => webhooks.redeliver(eventId),
    },
    disputes: {
      close(disputeId, outcome) {
        const d = engine.closeDispute(engine.find('dispute', disputeId, 'dispute'), outcome);
        persist();
        webhooks.kick();
        return clone(d);
      },
    },
    seed: {
      charges(count, o = {}) {
        const out = engine.seedCharges(count, o);
        persist();
        return out;
      },
    },
    payouts: {
      run() {
        const payouts = runPayouts();
        persist();
        webhooks.kick();
        return clone(payouts);
      },
    },
    customers: {
      failRenewals(customerId, fail = true, declineCode = 'generic_decline') {
        engine.setFailRenewals(customerId, fail, declineCode);
        persist();
      },
    },
    state: () => clone(store.state),
    reset() {
      store.reset();
      store.state.lastPayoutRunAt = engine.now();
      faults = noFaults();
      persist();
    },
  };
}
