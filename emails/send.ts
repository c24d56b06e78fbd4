import { randomUUID } from 'node:crypto';
import type { Resend } from 'resend';
import { renderEmail, type EmailData, type EmailName } from './render';

/** The mail service refused or could not take a message; `status` is its HTTP status (null: no answer). */
export class MailDeliveryError extends Error {
  constructor(
    message: string,
    readonly status: number | null,
    readonly code: string,
    readonly retryAfterSeconds?: number,
  ) {
    super(message);
    this.name = 'MailDeliveryError';
  }
}

export interface SendOptions {
  /** Same key → the service sends at most once (kept 24 h by the service); a fresh one is made per call otherwise. */
  idempotencyKey?: string;
  replyTo?: string;
}

export interface Mailer {
  send<N extends EmailName>(name: N, to: string, data: EmailData[N], options?: SendOptions): Promise<{ id: string }>;
  send(name: string, to: string, data: Record<string, unknown>, options?: SendOptions): Promise<{ id: string }>;
}

export interface CreateMailerOptions {
  resend: Resend;
  from: string;
  /** Longest wait honoured from a retry-after header before the single retry. */
  maxRetryDelayMs?: number;
  /** Wait used when a 429/5xx carries no retry-after. */
  defaultRetryDelayMs?: number;
  sleep?: (ms: number) => Promise<void>;
}

const RETRYABLE = (status: number | null) => status === 429 || (status !== null && status >= 500);

function retryAfterMs(headers: Record<string, string> | null, fallbackMs: number, maxMs: number): number {
  const raw = headers?.['retry-after'];
  const seconds = raw === undefined ? Number.NaN : Number(raw);
  const ms = Number.isFinite(seconds) && seconds >= 0 ? seconds * 1000 : fallbackMs;
  return Math.min(ms, maxMs);
}

export function createMailer({
  resend,
  from,
  maxRetryDelayMs = 5_000,
  defaultRetryDelayMs = 300,
  sleep = (ms) => new Promise((resolve) => setTimeout(resolve, ms)),
}: CreateMailerOptions): Mailer {
  async function send(name: string, to: string, data: Record<string, unknown>, options: SendOptions = {}) {
    const rendered = await renderEmail(name, data);
    // One key for both attempts, so a retry after a lost answer cannot send the message twice.
    const idempotencyKey = options.idempotencyKey ?? `${name}/${randomUUID()}`;
    const payload = {
      from,
      to,
      subject: rendered.subject,
      html: rendered.html,
      text: rendered.text,
      ...(options.replyTo ? { replyTo: options.replyTo } : {}),
      tags: [{ name: 'template', value: name.replace(/[^A-Za-z0-9_-]/g, '_') }],
    };
    let attempt = 0;
    for (;;) {
      attempt += 1;
      const { data: sent, error, headers } = await resend.emails.send(payload, { idempotencyKey });
      if (!error && sent) return { id: sent.id };
      const status = error?.statusCode ?? null;
      const wait = retryAfterMs(headers, defaultRetryDelayMs, maxRetryDelayMs);
      if (attempt === 1 && RETRYABLE(status)) {
        await sleep(wait);
        continue;
      }
      const retryHeader = headers?.['retry-after'];
      throw new MailDeliveryError(
        `mail service refused "${name}" to ${to}: ${error?.name ?? 'unknown_error'} (${status ?? 'no answer'}): ${error?.message ?? 'no message'}`,
        status,
        error?.name ?? 'unknown_error',
        retryHeader !== undefined && Number.isFinite(Number(retryHeader)) ? Number(retryHeader) : undefined,
      );
    }
  }
  return { send: send };
}
