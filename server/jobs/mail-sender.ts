import { Resend } from 'resend';
import type pg from 'pg';
import { drizzle } from 'drizzle-orm/node-postgres';
import * as schema from '../db/schema';
import type { Db } from '../db/client';
import { createReceiptsService } from '../modules/books/receipts.service';
import type { MailAttachmentRef } from '../modules/mail/mail.tables';
import { classifyDatabaseError } from '../db/errors';
import { renderEmail, type SharedData } from '../../emails/render';
import { MAIL_QUEUE_CHANNEL } from '../modules/mail/mail-queue';
import type { JobContext } from './queue';

/**
 * The mail sender: drains mail_queue (the outbox) through the resend SDK. Not a pg-boss job per message —
 * the rows are the queue. A worker claims due rows with FOR UPDATE SKIP LOCKED and a lease (state `sending`,
 * lease_until) — a single message on its own row, a batch on its mail_batches row (its messages stay `queued`
 * until their answer is written); a row whose worker died is claimed again once its lease has passed, and the service sees the
 * same Idempotency-Key (the row's key, or the batch key), so it answers with the first message's id instead of
 * sending it twice. 429/5xx/no answer → back to `queued` with a backoff that honours Retry-After; any other
 * refusal → `failed`. The service's answer is stored on the row. Woken by NOTIFY (sent by queueMail on commit)
 * and by a poll for due retries and expired leases.
 */

type Row = {
  id: string;
  idempotency_key: string;
  template: string;
  to_address: string;
  data: Record<string, unknown>;
  shared_key: string | null;
  headers: Record<string, string>;
  batch_key: string | null;
  attempts: number;
  attachments: MailAttachmentRef[];
};

/** A file as the SDK takes it (it sends the bytes base64-encoded, with `content_type`). */
type Attachment = { filename: string; content: Buffer; contentType: string };

/** Renders the files a row refers to, at send time (the row keeps references, not bytes). */
export function createAttachmentRenderer(pool: pg.Pool) {
  const receipts = createReceiptsService({ db: drizzle(pool, { schema }) as unknown as Db });
  return async (refs: MailAttachmentRef[] | null | undefined): Promise<Attachment[]> => {
    const out: Attachment[] = [];
    for (const ref of refs ?? []) {
      if (ref.kind === 'receipt') {
        const { pdf, filename } = await receipts.receiptPdfForMail(ref.receiptId);
        out.push({ filename, content: pdf, contentType: 'application/pdf' });
      } else throw new Error(`unknown attachment kind ${JSON.stringify((ref as { kind: unknown }).kind)}`);
    }
    return out;
  };
}

export type MailSenderOptions = {
  resend: Resend;
  from: string;
  leaseSeconds: number;
  maxAttempts: number;
  pollMs: number;
  /** Longest backoff between attempts (seconds). */
  maxBackoffSeconds: number;
  /** Rows sent at once by one worker (single messages in parallel). */
  concurrency: number;
};

export type Answer = { status: number | null; name: string; message: string; retryAfterSeconds?: number } | { id: string };

const retryable = (status: number | null) => status === null || status === 429 || status >= 500;

export function backoffSeconds(attempt: number, retryAfterSeconds: number | undefined, maxSeconds: number): number {
  // Exponential from 5 s (5, 10, 20 …), capped; a Retry-After from the service is a floor.
  const exp = Math.min(maxSeconds, 5 * 2 ** Math.max(0, attempt - 1));
  return Math.max(exp, Math.min(retryAfterSeconds ?? 0, maxSeconds));
}

function retryAfterOf(headers: Record<string, string> | null | undefined): number | undefined {
  const raw = headers?.['retry-after'];
  if (raw === undefined) return undefined;
  const n = Number(raw);
  if (Number.isFinite(n) && n >= 0) return n;
  const at = Date.parse(raw);
  return Number.isFinite(at) ? Math.max(0, (at - Date.now()) / 1000) : undefined;
}

export function mailSenderOptionsFrom(ctx: Pick<JobContext, 'config' | 'deps'>): MailSenderOptions {
  const { config } = ctx;
  const resend = (ctx.deps.resend as Resend | undefined) ?? new Resend(config.RESEND_API_KEY, { baseUrl: config.RESEND_BASE_URL });
  return {
    resend,
    from: config.MAIL_FROM,
    leaseSeconds: config.MAIL_LEASE_SECONDS,
    maxAttempts: config.MAIL_MAX_ATTEMPTS,
    pollMs: config.MAIL_POLL_MS,
    maxBackoffSeconds: config.MAIL_MAX_BACKOFF_SECONDS,
    concurrency: config.MAIL_SEND_CONCURRENCY,
  };
}

/**
 * The single messages a claim may take, as two CTEs `due` (queued and due, oldest first) and `expired` (a lease
 * that has run out), each locked and limited on its own: each is read from the front of an index
 * (mail_queue_single_due_idx; mail_queue_due_idx for leases), so a claim costs the same with 10 or 100,000 rows
 * waiting. (One `or` over both states made Postgres gather and sort every queued row on every claim.)
 */
function dueSingles(limit: string) {
  return `due as (select id, next_attempt_at as at from mail_queue
                   where state = 'queued' and batch_key is null and next_attempt_at <= now()
                   order by next_attempt_at limit ${limit} for update skip locked),
          expired as (select id, lease_until as at from mail_queue
                   where state = 'sending' and batch_key is null and lease_until < now()
                   order by lease_until limit ${limit} for update skip locked)`;
}

/**
 * Reads mail_shared rows by key, each once while it is in use: a shared row never changes once written, so the
 * copies of a dispatch read it once per sender instead of once per message. A missing row is an error (the
 * message cannot render), and is not kept, so a later attempt reads again.
 */
export function createSharedDataReader(pool: pg.Pool, keep = 16) {
  const held = new Map<string, Promise<SharedData>>();
  return (key: string): Promise<SharedData> => {
    let pending = held.get(key);
    if (pending) {
      // Most recently used last: the oldest one goes first when there are too many.
      held.delete(key);
      held.set(key, pending);
      return pending;
    }
    pending = pool.query<{ data: Record<string, unknown> }>('select data from mail_shared where key = $1', [key]).then(({ rows }) => {
      if (!rows[0]) throw new Error(`shared mail data "${key}" is missing`);
      return { key, data: rows[0].data };
    });
    held.set(key, pending);
    pending.catch(() => held.delete(key));
    if (held.size > keep) held.delete(held.keys().next().value!);
    return pending;
  };
}

export function createMailSender(pool: pg.Pool, opts: MailSenderOptions, log: JobContext['logger']) {
  const renderAttachments = createAttachmentRenderer(pool);
  const sharedData = createSharedDataReader(pool);
  /** Claims due single messages (up to `limit`). */
  async function claimSingles(limit: number): Promise<Row[]> {
    const { rows } = await pool.query<Row>(
      `with ${dueSingles('$2')}
       update mail_queue set state = 'sending', attempts = attempts + 1, lease_until = now() + make_interval(secs => $1), updated_at = now()
        where id in (select id from (select * from due union all select * from expired) c order by at limit $2)
        returning id, idempotency_key, template, to_address, data, shared_key, headers, batch_key, attempts, attachments`,
      [opts.leaseSeconds, limit],
    );
    return rows;
  }

  /**
   * Claims the next due batch (or one whose lease has run out) by leasing its mail_batches row — one row write for
   * the whole batch; its messages stay `queued` and are written once, with their answer — and returns the batch's
   * unsent messages with the batch's attempt count. A claimed batch without any such message is closed and the
   * next one claimed.
   */
  async function claimBatch(): Promise<Row[]> {
    for (;;) {
      const { rows } = await pool.query<Row & { claimed_key: string; batch_attempts: number }>(
        `with due as (select key, next_attempt_at as at from mail_batches where state = 'queued' and next_attempt_at <= now()
                        order by next_attempt_at limit 1 for update skip locked),
              expired as (select key, lease_until as at from mail_batches where state = 'sending' and lease_until < now()
                        order by lease_until limit 1 for update skip locked),
              picked as (select key from (select * from due union all select * from expired) c order by at limit 1),
         claimed as (
           update mail_batches b set state = 'sending', attempts = b.attempts + 1, lease_until = now() + make_interval(secs => $1),
                  updated_at = now()
             from picked where b.key = picked.key returning b.key, b.attempts)
         select c.key as claimed_key, c.attempts as batch_attempts,
                m.id, m.idempotency_key, m.template, m.to_address, m.data, m.shared_key, m.headers, m.batch_key, m.attachments
           from claimed c left join mail_queue m on m.batch_key = c.key and m.state = 'queued'
          order by m.idempotency_key`,
        [opts.leaseSeconds],
      );
      const first = rows[0];
      if (!first) return [];
      if (first.id !== null) return rows.map(({ claimed_key: _, batch_attempts, ...r }) => ({ ...r, attempts: batch_attempts }));
      await pool.query(`update mail_batches set state = 'sent', lease_until = null, updated_at = now() where key = $1`, [
        first.claimed_key,
      ]);
    }
  }

  /**
   * Writes the service's answer to the messages (and, for a batch, to its row, in the same statement): sent with
   * the service's ids; or due again after a backoff; or failed for good.
   */
  async function settle(rows: Row[], answer: Answer, ids?: string[]) {
    const batchKey = rows[0]?.batch_key ?? null;
    const attempts = Math.max(...rows.map((r) => r.attempts));
    if ('id' in answer || ids) {
      await pool.query(
        `with batch as (update mail_batches set state = 'sent', lease_until = null, updated_at = now() where key = $3)
         update mail_queue m set state = 'sent', provider_id = k.pid, last_answer = jsonb_build_object('id', k.pid),
                attempts = $4, sent_at = now(), lease_until = null, updated_at = now()
           from unnest($1::uuid[], $2::text[]) as k(id, pid) where m.id = k.id`,
        [rows.map((r) => r.id), ids ?? rows.map(() => (answer as { id: string }).id), batchKey, attempts],
      );
      return;
    }
    const again = retryable(answer.status) && attempts < opts.maxAttempts;
    const wait = backoffSeconds(attempts, answer.retryAfterSeconds, opts.maxBackoffSeconds);
    await pool.query(
      `with batch as (
         update mail_batches set state = $2::mail_state, lease_until = null, updated_at = now(),
                next_attempt_at = case when $2::mail_state = 'queued' then now() + make_interval(secs => $4::float8) else next_attempt_at end
          where key = $5)
       update mail_queue set state = $2::mail_state, last_answer = $3::jsonb, lease_until = null, attempts = $6, updated_at = now(),
              next_attempt_at = case when $2::mail_state = 'queued' then now() + make_interval(secs => $4::float8) else next_attempt_at end
        where id = any($1::uuid[])`,
      [rows.map((r) => r.id), again ? 'queued' : 'failed', JSON.stringify(answer), wait, batchKey, attempts],
    );
    if (!again) log.warn({ ids: rows.map((r) => r.id), answer }, 'mail failed for good');
  }

  async function payloadOf(row: Row) {
    const rendered = await renderEmail(row.template, row.data, row.shared_key === null ? null : await sharedData(row.shared_key));
    const attachments = await renderAttachments(row.attachments);
    return {
      ...(attachments.length ? { attachments } : {}),
      from: opts.from,
      to: row.to_address,
      subject: rendered.subject,
      html: rendered.html,
      text: rendered.text,
      headers: Object.keys(row.headers ?? {}).length ? row.headers : undefined,
      tags: [{ name: 'template', value: row.template.replace(/[^A-Za-z0-9_-]/g, '_') }],
    };
  }

  async function sendOne(row: Row) {
    let payload;
    try {
      payload = await payloadOf(row);
    } catch (err) {
      // An attachment read from a database that is down for now: try again later, like a service outage.
      if (classifyDatabaseError(err) === 'unavailable') {
        await settle([row], { status: null, name: 'render_unavailable', message: (err as Error).message });
        return;
      }
      // A template (or attachment) that cannot render will not render on a retry either.
      await pool.query(
        `update mail_queue set state = 'failed', lease_until = null, updated_at = now(), last_answer = $2::jsonb where id = $1`,
        [row.id, JSON.stringify({ status: null, name: 'render_failed', message: (err as Error).message })],
      );
      return;
    }
    let answer: Answer;
    try {
      const { data, error, headers } = await opts.resend.emails.send(payload, { idempotencyKey: row.idempotency_key });
      answer = data
        ? { id: data.id }
        : {
            status: error?.statusCode ?? null,
            name: error?.name ?? 'unknown_error',
            message: error?.message ?? 'no message',
            retryAfterSeconds: retryAfterOf(headers),
          };
    } catch (err) {
      answer = { status: null, name: 'network_error', message: (err as Error).message };
    }
    await settle([row], answer);
  }

  type Payload = Awaited<ReturnType<typeof payloadOf>>;

  /** Renders a claimed batch; a batch that cannot render is marked failed and comes back without payloads. */
  async function prepareBatch(rows: Row[]): Promise<{ rows: Row[]; payloads: Payload[] | null }> {
    const payloads = [];
    try {
      for (const r of rows) payloads.push(await payloadOf(r));
    } catch (err) {
      // Shared data read from a database that is down for now: the batch waits and goes again, like an outage.
      if (classifyDatabaseError(err) === 'unavailable') {
        await settle(rows, { status: null, name: 'render_unavailable', message: (err as Error).message });
        return { rows, payloads: null };
      }
      await pool.query(
        `with batch as (update mail_batches set state = 'failed', lease_until = null, updated_at = now() where key = $3)
         update mail_queue set state = 'failed', lease_until = null, attempts = $4, updated_at = now(), last_answer = $2::jsonb
          where id = any($1::uuid[])`,
        [
          rows.map((r) => r.id),
          JSON.stringify({ status: null, name: 'render_failed', message: (err as Error).message }),
          rows[0]?.batch_key ?? null,
          Math.max(...rows.map((r) => r.attempts)),
        ],
      );
      return { rows, payloads: null };
    }
    return { rows, payloads };
  }

  /** One batch call; returns the settle (the rows' new state) as its own promise, so the lane need not wait for it. */
  async function sendBatch(rows: Row[], payloads: Payload[]): Promise<{ settled: Promise<void> }> {
    let answer: Answer;
    let ids: string[] | undefined;
    try {
      const { data, error, headers } = await opts.resend.batch.send(payloads, {
        idempotencyKey: rows[0]!.batch_key!,
        batchValidation: 'strict',
      });
      if (data && data.data.length === rows.length) {
        ids = data.data.map((d) => d.id);
        answer = { id: ids[0]! };
      } else {
        answer = {
          status: error?.statusCode ?? null,
          name: error?.name ?? 'unknown_error',
          message: error?.message ?? 'no message',
          retryAfterSeconds: retryAfterOf(headers),
        };
      }
    } catch (err) {
      answer = { status: null, name: 'network_error', message: (err as Error).message };
    }
    return { settled: settle(rows, answer, ids) };
  }

  /**
   * One pass: claims and sends until nothing is due; returns how many rows it handled. `concurrency` batch lanes
   * each keep one batch call in flight: while a call is out, the lane already claims and renders its next batch,
   * and a batch's answer is written to its rows beside the next call (never more than `concurrency` calls in
   * flight; a row is `sending` under its lease until its answer is written, so a worker that dies in between
   * leaves it to be sent again under the same idempotency key). One lane beside them sends single messages,
   * `concurrency` at a time, so account mail queued behind a large dispatch never waits for the dispatch.
   */
  async function drain(): Promise<number> {
    let handled = 0;
    const settling = new Set<Promise<void>>();
    let settleError: { err: unknown } | null = null;
    const batchLane = async () => {
      const nextBatch = () => claimBatch().then((rows) => (rows.length ? prepareBatch(rows) : null));
      let next = nextBatch();
      try {
        for (;;) {
          const batch = await next;
          if (!batch) return;
          next = nextBatch();
          if (batch.payloads) {
            const { settled } = await sendBatch(batch.rows, batch.payloads);
            const tracked: Promise<void> = settled
              .catch((err: unknown) => void (settleError ??= { err }))
              .finally(() => settling.delete(tracked));
            settling.add(tracked);
          }
          handled += batch.rows.length;
        }
      } finally {
        // A claimed next batch the lane will not send (an error above) is left to its lease.
        next.catch(() => undefined);
      }
    };
    const singleLane = async () => {
      for (;;) {
        const singles = await claimSingles(opts.concurrency);
        if (!singles.length) return;
        for (const r of singles) inFlight.add(r.id);
        await Promise.all(singles.map((r) => sendOne(r).finally(() => inFlight.delete(r.id))));
        handled += singles.length;
      }
    };
    try {
      await Promise.all([singleLane(), ...Array.from({ length: opts.concurrency }, batchLane)]);
    } finally {
      await Promise.all(settling);
    }
    // A row whose answer could not be written stays `sending` until its lease ends, then goes again (same key).
    if (settleError) throw (settleError as { err: unknown }).err;
    return handled;
  }

  const inFlight = new Set<string>();
  let running: Promise<unknown> | null = null;
  let pending = false;
  let stopped = false;
  let timer: NodeJS.Timeout | null = null;
  let listener: pg.PoolClient | null = null;

  function kick() {
    if (stopped) return;
    if (running) {
      pending = true;
      return;
    }
    running = drain()
      .catch((err: unknown) => log.error({ err }, 'mail sender pass failed'))
      .finally(() => {
        running = null;
        if (pending) {
          pending = false;
          kick();
        }
      });
  }

  return {
    drain,
    async start() {
      listener = await pool.connect();
      listener.on('notification', () => kick());
      listener.on('error', (err) => log.warn({ err }, 'mail sender listen connection lost; polling only'));
      await listener.query(`listen ${MAIL_QUEUE_CHANNEL}`);
      timer = setInterval(kick, opts.pollMs);
      kick();
    },
    /** Stops claiming; waits for the messages being sent. */
    async stop() {
      stopped = true;
      if (timer) clearInterval(timer);
      await running;
      if (listener) {
        await listener.query(`unlisten ${MAIL_QUEUE_CHANNEL}`).catch(() => undefined);
        listener.release();
        listener = null;
      }
    },
  };
}
