// Webhook delivery: signed POSTs, retried with backoff while the endpoint fails, one object's events in order.
import { createHmac } from 'node:crypto';
import type { Delivery, Store } from './store';

/** `t=<unix seconds>,v1=<hex HMAC-SHA256 of "<t>.<body>">`, the header the SDK's constructEvent verifies. */
export function signatureHeader(payload: string, secret: string, timestampSeconds = Math.floor(Date.now() / 1000)): string {
  const v1 = createHmac('sha256', secret).update(`${timestampSeconds}.${payload}`, 'utf8').digest('hex');
  return `t=${timestampSeconds},v1=${v1}`;
}

export interface WebhookOptions {
  url: string | undefined;
  secret: string;
  /** Wait before each retry; the number of entries bounds the retries (attempts = entries + 1). */
  retryDelaysMs: readonly number[];
  timeoutMs: number;
  log: (line: string) => void;
}

export const defaultRetryDelaysMs = [1000, 2000, 4000, 8000, 16000, 32000, 60000, 60000, 60000] as const;

export interface FlushResult {
  delivered: number;
  failed: number;
  pending: number;
}

export class WebhookSender {
  private timer: NodeJS.Timeout | undefined;
  private inFlight = new Map<string, Promise<boolean>>();
  private closed = false;

  constructor(
    private readonly store: Store,
    private readonly opts: WebhookOptions,
  ) {}

  get enabled(): boolean {
    return Boolean(this.opts.url);
  }

  enqueue(eventId: string, objectKey: string, dropped: boolean): void {
    if (!this.opts.url) return;
    this.store.state.deliveries.push({
      eventId,
      objectKey,
      status: dropped ? 'dropped' : 'pending',
      attempts: 0,
      nextAttemptAtMs: Date.now(),
      lastStatusCode: null,
      lastError: null,
    });
  }

  redeliver(eventId: string): void {
    const event = this.store.getOf('event', eventId);
    if (!event) throw new Error(`no event ${eventId}`);
    this.enqueue(eventId, String(event.data?.object?.id ?? eventId), false);
    this.store.markDirty();
    this.kick();
  }

  /** The first unsettled delivery of each object: only these may be attempted. */
  private heads(): Delivery[] {
    const seen = new Set<string>();
    const heads: Delivery[] = [];
    for (const d of this.store.state.deliveries) {
      if (d.status !== 'pending' || seen.has(d.objectKey)) continue;
      seen.add(d.objectKey);
      heads.push(d);
    }
    return heads;
  }

  kick(): void {
    if (this.closed || !this.opts.url) return;
    if (this.timer) clearTimeout(this.timer);
    this.timer = undefined;
    const now = Date.now();
    let nextAt = Infinity;
    for (const head of this.heads()) {
      if (this.inFlight.has(head.objectKey)) continue;
      if (head.nextAttemptAtMs <= now) void this.attempt(head).then(() => this.kick());
      else nextAt = Math.min(nextAt, head.nextAttemptAtMs);
    }
    if (nextAt < Infinity) {
      this.timer = setTimeout(() => this.kick(), Math.max(0, nextAt - now));
      this.timer.unref();
    }
  }

  /** Delivers everything pending now, ignoring backoff; an object whose head fails is left for its retries. */
  async flush(): Promise<FlushResult> {
    const failedKeys = new Set<string>();
    for (let round = 0; round < 10_000; round++) {
      await Promise.all(this.inFlight.values());
      const heads = this.heads().filter((h) => !failedKeys.has(h.objectKey));
      if (heads.length === 0) break;
      const results = await Promise.all(heads.map(async (h) => ({ h, ok: await this.attempt(h) })));
      for (const { h, ok } of results) if (!ok) failedKeys.add(h.objectKey);
    }
    this.kick();
    const count = (s: Delivery['status']) => this.store.state.deliveries.filter((d) => d.status === s).length;
    return { delivered: count('delivered'), failed: count('failed'), pending: count('pending') };
  }

  private attempt(delivery: Delivery): Promise<boolean> {
    const existing = this.inFlight.get(delivery.objectKey);
    if (existing) return existing;
    const run = this.send(delivery).finally(() => this.inFlight.delete(delivery.objectKey));
    this.inFlight.set(delivery.objectKey, run);
    return run;
  }

  private async send(delivery: Delivery): Promise<boolean> {
    const event = this.store.getOf('event', delivery.eventId);
    if (!event || !this.opts.url) {
      delivery.status = 'failed';
      delivery.lastError = 'event not found';
      this.store.markDirty();
      return false;
    }
    const payload = JSON.stringify(event, null, 2);
    delivery.attempts += 1;
    let ok = false;
    try {
      const res = await fetch(this.opts.url, {
        method: 'POST',
        headers: {
          'content-type': 'application/json; charset=utf-8',
          'stripe-signature': signatureHeader(payload, this.opts.secret),
          'user-agent': 'local-payments-fake/1.0 (webhooks)',
        },
        body: payload,
        signal: AbortSignal.timeout(this.opts.timeoutMs),
      });
      await res.arrayBuffer().catch(() => undefined);
      delivery.lastStatusCode = res.status;
      delivery.lastError = res.ok ? null : `HTTP ${res.status}`;
      ok = res.ok;
    } catch (err) {
      delivery.lastStatusCode = null;
      delivery.lastError = (err as Error).message;
    }
    if (this.closed) return ok;
    if (ok) {
      delivery.status = 'delivered';
      event.pending_webhooks = 0;
    } else if (delivery.attempts > this.opts.retryDelaysMs.length) {
      delivery.status = 'failed';
      event.pending_webhooks = 0;
      this.opts.log(`webhook ${event.type} ${event.id} given up after ${delivery.attempts} attempts: ${delivery.lastError}`);
    } else {
      delivery.nextAttemptAtMs = Date.now() + this.opts.retryDelaysMs[delivery.attempts - 1]!;
    }
    this.store.markDirty();
    return ok;
  }

  async close(): Promise<void> {
    this.closed = true;
    if (this.timer) clearTimeout(this.timer);
    await Promise.allSettled(this.inFlight.values());
  }
}
