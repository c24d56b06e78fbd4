import { z } from 'zod';
import { DEFAULT_CONNECT_TIMEOUT_MS, DEFAULT_STATEMENT_TIMEOUT_MS } from './db/client';

// The environment, parsed once. Defaults are the local loopback set-up that `npm start` brings up.
const configSchema = z.object({
  NODE_ENV: z.enum(['development', 'production', 'test']).default('development'),
  PORT: z.coerce.number().int().min(1).max(65535).default(3000),
  HOST: z.string().default('127.0.0.1'),
  PUBLIC_URL: z.url().default('http://127.0.0.1:3000'),
  DATABASE_URL: z
    .string()
    .regex(/^postgres(ql)?:\/\//, 'must be a postgres:// URL')
    .default('postgres://postgres@127.0.0.1:54329/lightkeel'),
  DATABASE_POOL_MAX: z.coerce.number().int().min(1).max(200).default(20),
  // How long to wait for a database connection, and the longest a statement may run (lock waits included),
  // so an outage or a locked table answers 503 instead of holding every connection.
  DATABASE_CONNECT_TIMEOUT_MS: z.coerce.number().int().min(100).max(600_000).default(DEFAULT_CONNECT_TIMEOUT_MS),
  DATABASE_STATEMENT_TIMEOUT_MS: z.coerce.number().int().min(100).max(3_600_000).default(DEFAULT_STATEMENT_TIMEOUT_MS),
  SESSION_SECRET: z.string().min(16, 'must be at least 16 characters').default('lightkeel-local-session-secret-change-me'),
  TRUST_PROXY: z
    .enum(['true', 'false'])
    .default('false')
    .transform((v) => v === 'true'),
  LOG_LEVEL: z.enum(['fatal', 'error', 'warn', 'info', 'debug', 'trace', 'silent']).default('info'),
  JSON_BODY_LIMIT: z.string().default('100kb'),
  UPLOAD_LIMIT_BYTES: z.coerce
    .number()
    .int()
    .min(1024)
    .default(20 * 1024 * 1024),
  // Failed sign-ins per client address per window (successes are not counted).
  SIGN_IN_LIMIT_PER_IP: z.coerce.number().int().min(1).default(30),
  // Failed sign-ins on one account before each further try from a failing address must wait (first delay, then doubling).
  SIGN_IN_LIMIT_PER_ACCOUNT: z.coerce.number().int().min(1).default(5),
  SIGN_IN_FIRST_DELAY_SECONDS: z.coerce.number().int().min(1).max(3600).default(1),
  SIGN_IN_MAX_DELAY_SECONDS: z.coerce.number().int().min(1).max(86_400).default(300),
  SIGN_IN_WINDOW_SECONDS: z.coerce.number().int().min(1).default(900),
  // Separate budgets per address per window for the other signed-out actions.
  SIGN_UP_LIMIT_PER_IP: z.coerce.number().int().min(1).default(10),
  PASSWORD_RESET_LIMIT_PER_IP: z.coerce.number().int().min(1).default(10),
  MAIL_FROM: z.string().default('Lightkeel <mission@saltmarsh.example>'),
  RESEND_API_KEY: z.string().min(1).default('re_lightkeel_local'),
  RESEND_BASE_URL: z.url().default('http://127.0.0.1:4020'),
  GOOGLE_CLIENT_ID: z.string().default('lightkeel-local-client'),
  GOOGLE_CLIENT_SECRET: z.string().default('lightkeel-local-secret'),
  // Base of the identity provider's /authorize, /token and /userinfo; empty = Google's own endpoints.
  GOOGLE_OAUTH_BASE_URL: z.union([z.url(), z.literal('')]).default('http://127.0.0.1:4010'),
  STRIPE_SECRET_KEY: z.string().min(1).default('sk_test_lightkeel_local'),
  STRIPE_WEBHOOK_SECRET: z.string().min(1).default('whsec_lightkeel_local'),
  // host:port of the payment API; empty = the processor's own API.
  STRIPE_API_BASE_URL: z.union([z.url(), z.literal('')]).default('http://127.0.0.1:4030'),
  // How long a public campaign read may be served from memory (progress is "consistent within seconds").
  CAMPAIGN_CACHE_MS: z.coerce.number().int().min(0).max(60_000).default(3000),
  // Dispatch images: the local-disk storage folder, and the limits a hero image must keep.
  UPLOADS_DIR: z.string().min(1).default('.data/uploads'),
  HERO_IMAGE_MAX_BYTES: z.coerce
    .number()
    .int()
    .min(1024)
    .default(5 * 1024 * 1024),
  HERO_IMAGE_MAX_PIXELS: z.coerce.number().int().min(1).default(24_000_000),
  // Messages per batch call when a dispatch is e-mailed (the mail service takes at most 100).
  DISPATCH_BATCH_SIZE: z.coerce.number().int().min(1).max(100).default(100),
  // Background jobs (server/jobs): how long a stopping worker waits for running jobs; old job rows.
  JOBS_SHUTDOWN_TIMEOUT_MS: z.coerce.number().int().min(1000).default(30_000),
  JOB_ARCHIVE_AFTER_SECONDS: z.coerce
    .number()
    .int()
    .min(60)
    .default(12 * 3600),
  JOB_RETENTION_DAYS: z.coerce.number().int().min(1).default(7),
  JOB_MAINTENANCE_INTERVAL_SECONDS: z.coerce.number().int().min(1).default(60),
  // The mail queue (outbox): claim lease, attempts before a message is marked failed, poll for due retries.
  /** A reconciliation job not finished in this time is taken as dead (its worker died) and handed out again. */
  RECON_JOB_EXPIRE_SECONDS: z.coerce.number().int().min(2).default(1800),
  MAIL_LEASE_SECONDS: z.coerce.number().int().min(5).default(120),
  MAIL_MAX_ATTEMPTS: z.coerce.number().int().min(1).default(10),
  MAIL_POLL_MS: z.coerce.number().int().min(50).default(2000),
  MAIL_MAX_BACKOFF_SECONDS: z.coerce.number().int().min(1).default(900),
  MAIL_SEND_CONCURRENCY: z.coerce.number().int().min(1).max(50).default(4),
  MAIL_QUEUE_KEEP_DAYS: z.coerce.number().int().min(1).default(90),
  // A previewed upload nobody imports or cancels releases its held text after this long.
  UPLOAD_HOLD_HOURS: z.coerce.number().int().min(1).default(48),
  // An element-set preview or import whose worker went silent this long is handed to another worker (pg-boss expiry).
  INGEST_JOB_EXPIRE_SECONDS: z.coerce.number().int().min(2).default(900),
  // Stored images (dispatch heroes, frozen charts) that no dispatch or version uses any more are removed after this long.
  ORPHAN_FILE_HOURS: z.coerce.number().int().min(1).default(24),
  /** How long a repeated pledge submit waits for the first one to open the checkout before answering 202. */
  PLEDGE_CHECKOUT_WAIT_MS: z.coerce.number().int().min(0).max(120_000).default(15_000),
});

export type Config = z.infer<typeof configSchema>;

// The local defaults above are public (they are in this file): production must bring its own.
const localSecrets = [
  'SESSION_SECRET',
  'STRIPE_SECRET_KEY',
  'STRIPE_WEBHOOK_SECRET',
  'RESEND_API_KEY',
  'GOOGLE_CLIENT_ID',
  'GOOGLE_CLIENT_SECRET',
] as const;
const serviceUrls = ['RESEND_BASE_URL', 'STRIPE_API_BASE_URL', 'GOOGLE_OAUTH_BASE_URL'] as const;

/** localhost, 127.0.0.0/8, ::1 and 0.0.0.0: where the local fakes listen. */
export function isLoopbackUrl(value: string) {
  if (!value) return false;
  const host = new URL(value).hostname.replace(/^\[|\]$/g, '').toLowerCase();
  return host === 'localhost' || host.endsWith('.localhost') || /^127\./.test(host) || host === '::1' || host === '0.0.0.0';
}

const productionSchema = configSchema.superRefine((config, ctx) => {
  if (config.NODE_ENV !== 'production') return;
  const defaults = configSchema.parse({});
  for (const name of localSecrets) {
    if (config[name] === defaults[name]) {
      ctx.addIssue({
        code: 'custom',
        path: [name],
        message: 'is the local default, which is public; set a value of your own for production',
      });
    }
  }
  for (const name of serviceUrls) {
    if (isLoopbackUrl(config[name])) {
      ctx.addIssue({
        code: 'custom',
        path: [name],
        message: `points at loopback (${config[name]}), where the local fakes run; set the real service's address for production`,
      });
    }
  }
});

export class ConfigError extends Error {}

export function loadConfig(env: Record<string, string | undefined> = process.env): Config {
  const result = productionSchema.safeParse(env);
  if (!result.success) {
    const lines = result.error.issues.map((i) => `  ${i.path.join('.')}: ${i.message}`);
    throw new ConfigError(`Invalid configuration:\n${lines.join('\n')}`);
  }
  return result.data;
}
