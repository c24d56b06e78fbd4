// The fake's whole state as one JSON document, written atomically (temp file + rename) after each change.
import { randomBytes } from 'node:crypto';
import { existsSync, mkdirSync, readFileSync, renameSync, writeFileSync } from 'node:fs';
import path from 'node:path';

/** A processor API object as it goes over the wire (JSON). */
export type ApiObject = { id: string; object: string; created: number; [field: string]: any };

export const collectionNames = [
  'customer',
  'product',
  'price',
  'checkout_session',
  'payment_intent',
  'charge',
  'refund',
  'dispute',
  'subscription',
  'invoice',
  'balance_transaction',
  'payout',
  'payment_method',
  'billing_portal_session',
  'event',
] as const;
export type CollectionName = (typeof collectionNames)[number];

export interface Delivery {
  eventId: string;
  /** Deliveries of one object go out in creation order: the next waits until this one is settled. */
  objectKey: string;
  status: 'pending' | 'delivered' | 'failed' | 'dropped';
  attempts: number;
  nextAttemptAtMs: number;
  lastStatusCode: number | null;
  lastError: string | null;
}

export interface IdempotencyRecord {
  method: string;
  path: string;
  paramsHash: string;
  status: number;
  body: string;
  createdMs: number;
}

/** Per-object facts the processor keeps but does not show in the object itself. */
export interface Internal {
  cardBehaviour?: string;
  /** checkout session: what to copy onto the objects created when it completes */
  sessionLineItems?: ApiObject[];
  subscriptionMetadata?: Record<string, string>;
  paymentIntentMetadata?: Record<string, string>;
  paymentIntentDescription?: string;
  /** checkout session: the caller's description of what is paid for, shown on the hosted page */
  sessionDescription?: string | null;
  paymentIntent?: string;
  /** customer: every renewal charge is declined with this code while set */
  failRenewals?: string;
  /** balance transaction: the payout that paid it out */
  payout?: string;
}

export interface State {
  version: 1;
  clockOffsetSeconds: number;
  lastPayoutRunAt: number | null;
  collections: Record<CollectionName, ApiObject[]>;
  internal: Record<string, Internal>;
  idempotency: Record<string, IdempotencyRecord>;
  deliveries: Delivery[];
}

export function emptyState(): State {
  const collections = {} as Record<CollectionName, ApiObject[]>;
  for (const name of collectionNames) collections[name] = [];
  return { version: 1, clockOffsetSeconds: 0, lastPayoutRunAt: null, collections, internal: {}, idempotency: {}, deliveries: [] };
}

const alphabet = 'abcdefghijklmnopqrstuvwxyzABCDEFGHIJKLMNOPQRSTUVWXYZ0123456789';
export function newId(prefix: string, length = 24): string {
  const bytes = randomBytes(length);
  let out = '';
  for (const b of bytes) out += alphabet[b % alphabet.length];
  return `${prefix}_${out}`;
}

export class Store {
  state: State;
  private index = new Map<string, ApiObject>();
  private dirty = false;
  private lastWriteMs = 0;
  private timer: NodeJS.Timeout | undefined;
  private readonly onExit = () => this.flush();

  /** Writes are throttled to one per `minWriteIntervalMs` (the last change always lands; `flush` forces it). */
  constructor(
    private readonly statePath: string | undefined,
    private readonly minWriteIntervalMs = 100,
  ) {
    this.state = emptyState();
    if (statePath && existsSync(statePath)) {
      const text = readFileSync(statePath, 'utf8');
      let parsed: State;
      try {
        parsed = JSON.parse(text) as State;
      } catch (err) {
        throw new Error(`payments fake: state file ${statePath} is not valid JSON (${(err as Error).message})`, { cause: err });
      }
      if (parsed.version !== 1) throw new Error(`payments fake: state file ${statePath} has unknown version ${String(parsed.version)}`);
      const base = emptyState();
      this.state = { ...base, ...parsed, collections: { ...base.collections, ...parsed.collections } };
    }
    for (const name of collectionNames) for (const obj of this.state.collections[name]) this.index.set(obj.id, obj);
    if (statePath) process.on('exit', this.onExit);
  }

  insert(name: CollectionName, obj: ApiObject): ApiObject {
    this.state.collections[name].push(obj);
    this.index.set(obj.id, obj);
    return obj;
  }

  get(id: string): ApiObject | undefined {
    return this.index.get(id);
  }

  getOf(name: CollectionName, id: string): ApiObject | undefined {
    const obj = this.index.get(id);
    return obj && this.state.collections[name].includes(obj) ? obj : undefined;
  }

  all(name: CollectionName): ApiObject[] {
    return this.state.collections[name];
  }

  remove(name: CollectionName, id: string): void {
    this.state.collections[name] = this.state.collections[name].filter((o) => o.id !== id);
    this.index.delete(id);
  }

  internal(id: string): Internal {
    return (this.state.internal[id] ??= {});
  }

  reset(): void {
    this.state = emptyState();
    this.index.clear();
  }

  /** Drops events created before `cutoffSeconds` whose deliveries are settled (the processor keeps 30 days). */
  pruneEvents(cutoffSeconds: number): void {
    const events = this.state.collections.event;
    if (events.length === 0 || events[0]!.created >= cutoffSeconds) return;
    const pending = new Set(this.state.deliveries.filter((d) => d.status === 'pending').map((d) => d.eventId));
    const drop = new Set(events.filter((e) => e.created < cutoffSeconds && !pending.has(e.id)).map((e) => e.id));
    if (drop.size === 0) return;
    this.state.collections.event = events.filter((e) => !drop.has(e.id));
    for (const id of drop) this.index.delete(id);
    this.state.deliveries = this.state.deliveries.filter((d) => !drop.has(d.eventId));
  }

  markDirty(): void {
    if (!this.statePath) return;
    this.dirty = true;
    const wait = this.lastWriteMs + this.minWriteIntervalMs - Date.now();
    if (wait <= 0) this.write();
    else if (!this.timer) {
      this.timer = setTimeout(() => {
        this.timer = undefined;
        if (this.dirty) this.write();
      }, wait);
      this.timer.unref();
    }
  }

  flush(): void {
    if (this.dirty) this.write();
  }

  close(): void {
    this.flush();
    if (this.timer) clearTimeout(this.timer);
    this.timer = undefined;
    process.off('exit', this.onExit);
  }

  private write(): void {
    if (this.timer) clearTimeout(this.timer);
    this.timer = undefined;
    this.dirty = false;
    this.lastWriteMs = Date.now();
    if (!this.statePath) return;
    mkdirSync(path.dirname(this.statePath), { recursive: true });
    const tmp = `${this.statePath}.${process.pid}.tmp`;
    writeFileSync(tmp, JSON.stringify(this.state));
    renameSync(tmp, this.statePath);
  }
}
