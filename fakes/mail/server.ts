import { createHash, randomUUID } from 'node:crypto';
import { mkdirSync, readFileSync, renameSync, writeFileSync, existsSync } from 'node:fs';
import { createServer, type Server } from 'node:http';
import { dirname } from 'node:path';
import express, { type NextFunction, type Request, type Response } from 'express';
import { closeServer, listenOnLoopback } from '../lib/loopback-server';
import { renderNotFound, renderOutboxList, renderOutboxMessage } from './outbox-page';
import { ApiError, bareAddress, MAX_BATCH_EMAILS, validateEmail, type EmailInput } from './validate';

export { MAX_BATCH_EMAILS, MAX_TO_RECIPIENTS } from './validate';

export interface StoredMessage extends EmailInput {
  object: 'email';
  id: string;
  message_id: string;
  created_at: string;
  last_event: 'delivered' | 'scheduled';
  /** Set when the message arrived through POST /emails/batch. */
  batch_id: string | null;
}

export interface MailFaults {
  /** The next n API requests answer 429 rate_limit_exceeded with a retry-after header. */
  rateLimitNext?: number;
  /** The next n API requests answer 500 internal_server_error. */
  failNext?: number;
  /** Every API request waits this long (ms) before it is handled: a slow service. */
  delayMs?: number;
  /** Seconds announced in retry-after for injected 429s. */
  retryAfterSeconds?: number;
}

export interface MailFake {
  url: string;
  port: number;
  close(): Promise<void>;
  /** Every accepted message, newest first. */
  messages(): StoredMessage[];
  clear(): void;
  faults: { set(faults: MailFaults): void; get(): Required<MailFaults> };
}

export interface MailFakeOptions {
  port?: number;
  apiKey?: string;
  /** JSON file that keeps messages across restarts; none → memory only. */
  statePath?: string;
  /** Seconds announced in retry-after for injected 429s. */
  retryAfterSeconds?: number;
}

const IDEMPOTENCY_TTL_MS = 24 * 60 * 60 * 1000; // the service keeps keys for 24 hours (its docs)
const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

function loadState(path: string | undefined): StoredMessage[] {
  if (!path || !existsSync(path)) return [];
  try {
    const parsed = JSON.parse(readFileSync(path, 'utf8')) as { messages?: unknown };
    return Array.isArray(parsed.messages) ? (parsed.messages as StoredMessage[]) : [];
  } catch (err) {
    throw new Error(`mail fake: cannot read state file ${path}: ${(err as Error).message}`, { cause: err });
  }
}

function countOf(value: unknown, field: string): number | undefined {
  if (value === undefined) return undefined;
  if (typeof value !== 'number' || !Number.isInteger(value) || value < 0 || value > 1000) {
    throw new ApiError(400, 'validation_error', `\`${field}\` must be an integer from 0 to 1000.`);
  }
  return value;
}

function msOf(value: unknown, field: string): number | undefined {
  if (value === undefined) return undefined;
  if (typeof value !== 'number' || !Number.isInteger(value) || value < 0 || value > 60_000) {
    throw new ApiError(400, 'validation_error', `\`${field}\` must be an integer from 0 to 60000 (milliseconds).`);
  }
  return value;
}

export async function createMailFake(opts: MailFakeOptions = {}): Promise<MailFake> {
  const apiKey = opts.apiKey ?? 're_lightkeel_local';
  let store: StoredMessage[] = loadState(opts.statePath); // oldest first
  const faultState = { rateLimitNext: 0, failNext: 0, delayMs: 0, retryAfterSeconds: opts.retryAfterSeconds ?? 1 };
  const idempotency = new Map<string, { hash: string; body: unknown; at: number }>();

  function persist(): void {
    if (!opts.statePath) return;
    mkdirSync(dirname(opts.statePath), { recursive: true });
    const tmp = `${opts.statePath}.${process.pid}.tmp`;
    writeFileSync(tmp, JSON.stringify({ messages: store }, null, 2));
    renameSync(tmp, opts.statePath); // atomic replace: a crash never leaves half a file
  }

  function accept(input: EmailInput, batchId: string | null): StoredMessage {
    const id = randomUUID();
    const message: StoredMessage = {
      object: 'email',
      id,
      message_id: `<${id}@lightkeel.local>`,
      created_at: new Date().toISOString(),
      last_event: input.scheduled_at && Date.parse(input.scheduled_at) > Date.now() ? 'scheduled' : 'delivered',
      batch_id: batchId,
      ...input,
    };
    store.push(message);
    return message;
  }

  const newestFirst = () => [...store].reverse();

  const app = express();
  app.disable('x-powered-by');
  app.set('etag', false);

  const sendError = (res: Response, err: ApiError) => {
    res.status(err.statusCode).set(err.headers).json(err.toJSON());
  };

  // --- service API -------------------------------------------------------------------------
  const requireApiKey = (req: Request, _res: Response, next: NextFunction) => {
    const header = req.get('authorization');
    if (!header || !/^Bearer\s+\S+/i.test(header)) {
      return next(new ApiError(401, 'missing_api_key', 'Missing API key in the authorization header.'));
    }
    if (header.replace(/^Bearer\s+/i, '').trim() !== apiKey) {
      return next(new ApiError(403, 'invalid_api_key', 'API key is invalid.'));
    }
    next();
  };
  const injectFaults = async (_req: Request, _res: Response, next: NextFunction) => {
    if (faultState.delayMs > 0) await new Promise((r) => setTimeout(r, faultState.delayMs));
    const retryAfterSeconds = faultState.retryAfterSeconds;
    if (faultState.rateLimitNext > 0) {
      faultState.rateLimitNext -= 1;
      return next(
        new ApiError(429, 'rate_limit_exceeded', 'Too many requests. Slow down and retry after the time in the retry-after header.', {
          'retry-after': String(retryAfterSeconds),
          'ratelimit-limit': '2',
          'ratelimit-remaining': '0',
          'ratelimit-reset': String(retryAfterSeconds),
        }),
      );
    }
    if (faultState.failNext > 0) {
      faultState.failNext -= 1;
      return next(new ApiError(500, 'internal_server_error', 'An unexpected error occurred (injected by the local mail fake).'));
    }
    next();
  };
  app.use('/emails', requireApiKey, injectFaults, express.json({ limit: '45mb' }));

  // Same key + same payload → the first answer again; same key + other payload → 409.
  function withIdempotency(req: Request, res: Response, produce: () => unknown): void {
    const key = req.get('idempotency-key');
    if (key === undefined) {
      res.status(200).json(produce());
      return;
    }
    if (key.length < 1 || key.length > 256) {
      throw new ApiError(400, 'invalid_idempotency_key', 'The key must be between 1-256 chars.');
    }
    const now = Date.now();
    for (const [k, v] of idempotency) if (now - v.at > IDEMPOTENCY_TTL_MS) idempotency.delete(k);
    const hash = createHash('sha256')
      .update(req.path)
      .update(JSON.stringify(req.body ?? null))
      .digest('hex');
    const seen = idempotency.get(key);
    if (seen) {
      if (seen.hash !== hash) {
        throw new ApiError(409, 'invalid_idempotent_request', 'Same idempotency key used with a different request payload.');
      }
      res.status(200).json(seen.body);
      return;
    }
    const body = produce();
    idempotency.set(key, { hash, body, at: now });
    res.status(200).json(body);
  }

  app.post('/emails', (req, res) => {
    withIdempotency(req, res, () => {
      const input = validateEmail(req.body, { batch: false });
      const message = accept(input, null);
      persist();
      return { id: message.id };
    });
  });

  app.post('/emails/batch', (req, res) => {
    const mode = (req.get('x-batch-validation') ?? 'strict').toLowerCase();
    if (mode !== 'strict' && mode !== 'permissive') {
      throw new ApiError(400, 'validation_error', 'The `x-batch-validation` header must be `strict` or `permissive`.');
    }
    withIdempotency(req, res, () => {
      const list: unknown = req.body;
      if (!Array.isArray(list)) throw new ApiError(400, 'validation_error', 'The request body must be an array of e-mails.');
      if (list.length === 0) throw new ApiError(400, 'validation_error', 'The batch must hold at least one e-mail.');
      if (list.length > MAX_BATCH_EMAILS) {
        throw new ApiError(400, 'validation_error', `Too many e-mails in one batch: ${list.length}; the maximum is ${MAX_BATCH_EMAILS}.`);
      }
      const results = list.map((item, index) => {
        try {
          return { index, input: validateEmail(item, { batch: true }) };
        } catch (err) {
          if (!(err instanceof ApiError)) throw err;
          return { index, error: err };
        }
      });
      const failed = results.filter((r) => r.error);
      if (mode === 'strict' && failed[0]?.error) {
        const first = failed[0].error;
        // Strict mode: nothing is sent when any item is invalid.
        throw new ApiError(first.statusCode, first.errorName, `emails[${failed[0].index}]: ${first.message}`);
      }
      const batchId = randomUUID();
      const data = results.flatMap((r) => (r.input ? [{ id: accept(r.input, batchId).id }] : []));
      persist();
      return mode === 'permissive' ? { data, errors: failed.map((r) => ({ index: r.index, message: r.error?.message ?? '' })) } : { data };
    });
  });

  app.get('/emails/:id', (req, res) => {
    const id = String(req.params.id);
    if (!UUID.test(id)) throw new ApiError(422, 'invalid_parameter', 'The `id` must be a valid UUID.');
    const m = store.find((s) => s.id === id);
    if (!m) throw new ApiError(404, 'not_found', 'Email not found.');
    res.json({
      object: 'email',
      id: m.id,
      message_id: m.message_id,
      to: m.to,
      from: m.from,
      created_at: m.created_at,
      subject: m.subject,
      html: m.html,
      text: m.text,
      bcc: m.bcc,
      cc: m.cc,
      reply_to: m.reply_to,
      last_event: m.last_event,
      scheduled_at: m.scheduled_at,
      tags: m.tags,
    });
  });

  // --- test and outbox routes ----------------------------------------------------------------
  app.post('/_fake/faults', express.json(), (req, res) => {
    const body = (req.body ?? {}) as Record<string, unknown>;
    const rateLimitNext = countOf(body.rateLimitNext, 'rateLimitNext');
    const failNext = countOf(body.failNext, 'failNext');
    const delayMs = msOf(body.delayMs, 'delayMs');
    const retryAfterSeconds = countOf(body.retryAfterSeconds, 'retryAfterSeconds');
    setFaults({ rateLimitNext, failNext, delayMs, retryAfterSeconds });
    res.json({ ...faultState });
  });
  app.get('/_fake/faults', (_req, res) => {
    res.json({ ...faultState });
  });
  app.get('/_fake/messages', (req, res) => {
    const to = typeof req.query.to === 'string' ? req.query.to.trim().toLowerCase() : '';
    const list = newestFirst().filter((m) => !to || [...m.to, ...(m.cc ?? []), ...(m.bcc ?? [])].some((a) => bareAddress(a) === to));
    res.json({ object: 'list', data: list });
  });
  app.delete('/_fake/messages', (_req, res) => {
    clear();
    res.status(204).end();
  });

  const outboxHeaders = (res: Response) =>
    res.set({
      'Content-Security-Policy':
        "default-src 'none'; style-src 'unsafe-inline'; frame-src 'self'; frame-ancestors 'none'; base-uri 'none'; form-action 'none'",
      'X-Content-Type-Options': 'nosniff',
      'Referrer-Policy': 'no-referrer',
      'Cache-Control': 'no-store',
    });
  app.get(['/', '/outbox'], (_req, res) => {
    outboxHeaders(res).type('html').send(renderOutboxList(newestFirst()));
  });
  app.get('/outbox/:id', (req, res) => {
    const m = store.find((s) => s.id === req.params.id);
    if (!m)
      return void outboxHeaders(res)
        .status(404)
        .type('html')
        .send(renderNotFound(String(req.params.id)));
    outboxHeaders(res).type('html').send(renderOutboxMessage(m));
  });
  app.get('/outbox/:id/attachments/:index', (req, res) => {
    const m = store.find((s) => s.id === req.params.id);
    const a = m?.attachments[Number(req.params.index)];
    if (!a?.content) return void res.status(404).type('text').send('No such attachment.');
    const name = (a.filename ?? 'attachment').replace(/[^A-Za-z0-9._-]/g, '_');
    res
      .set({
        'Content-Type': a.content_type ?? 'application/octet-stream',
        'Content-Disposition': `attachment; filename="${name}"`,
        'X-Content-Type-Options': 'nosniff',
        'Cache-Control': 'no-store',
      })
      .send(Buffer.from(a.content, 'base64'));
  });
  app.get('/outbox/:id/html', (req, res) => {
    const m = store.find((s) => s.id === req.params.id);
    if (!m || !m.html) return void res.status(404).type('text').send('No HTML part.');
    // The message HTML is untrusted: no scripts, no network beyond images on loopback (the local app's charts), framed by the outbox only.
    res
      .set({
        'Content-Security-Policy':
          "sandbox; default-src 'none'; style-src 'unsafe-inline'; img-src data: http://127.0.0.1:* http://localhost:*; font-src data:; frame-ancestors 'self'",
        'X-Content-Type-Options': 'nosniff',
        'Cache-Control': 'no-store',
      })
      .type('html')
      .send(m.html);
  });

  app.use((_req, _res, next) => next(new ApiError(404, 'not_found', 'The requested endpoint does not exist.')));
  app.use((err: unknown, _req: Request, res: Response, _next: NextFunction) => {
    if (err instanceof ApiError) return sendError(res, err);
    const e = err as { type?: string; status?: number; message?: string };
    if (e?.type === 'entity.parse.failed')
      return sendError(res, new ApiError(400, 'validation_error', 'The request body is not valid JSON.'));
    if (e?.type === 'entity.too.large') return sendError(res, new ApiError(413, 'validation_error', 'The request body is too large.'));
    sendError(res, new ApiError(500, 'internal_server_error', `Unexpected error in the local mail fake: ${e?.message ?? String(err)}`));
  });

  function setFaults(f: MailFaults): void {
    if (f.rateLimitNext !== undefined) faultState.rateLimitNext = countOf(f.rateLimitNext, 'rateLimitNext') ?? 0;
    if (f.failNext !== undefined) faultState.failNext = countOf(f.failNext, 'failNext') ?? 0;
    if (f.delayMs !== undefined) faultState.delayMs = msOf(f.delayMs, 'delayMs') ?? 0;
    if (f.retryAfterSeconds !== undefined) faultState.retryAfterSeconds = countOf(f.retryAfterSeconds, 'retryAfterSeconds') ?? 1;
  }
  function clear(): void {
    store = [];
    idempotency.clear();
    persist();
  }

  const server: Server = createServer(app);
  const port = await listenOnLoopback(server, opts.port ?? 0);

  return {
    url: `http://127.0.0.1:${port}`,
    port,
    messages: newestFirst,
    clear,
    faults: { set: setFaults, get: () => ({ ...faultState }) },
    close: () => closeServer(server),
  };
}
