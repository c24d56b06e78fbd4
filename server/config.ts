import { z } from 'zod';

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
  SIGN_IN_LIMIT_PER_IP: z.coerce.number().int().min(1).default(30),
  SIGN_IN_LIMIT_PER_ACCOUNT: z.coerce.number().int().min(1).default(8),
  SIGN_IN_WINDOW_SECONDS: z.coerce.number().int().min(1).default(900),
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
  MAIL_LEASE_SECONDS: z.coerce.number().int().min(5).default(120),
  MAIL_MAX_ATTEMPTS: z.coerce.number().int().min(1).default(10),
  MAIL_POLL_MS: z.coerce.number().int().min(50).default(2000),
  MAIL_MAX_BACKOFF_SECONDS: z.coerce.number().int().min(1).default(900),
  MAIL_SEND_CONCURRENCY: z.coerce.number().int().min(1).max(50).default(4),
  MAIL_QUEUE_KEEP_DAYS: z.coerce.number().int().min(1).default(90),
  // A previewed upload nobody imports or cancels releases its held text after this long.
  UPLOAD_HOLD_HOURS: z.coerce.number().int().min(1).default(48),
});

export type Config = z.infer<typeof configSchema>;

export class ConfigError extends Error {}

export function loadConfig(env: Record<string, string | undefined> = process.env): Config {
  const result = configSchema.safeParse(env);
  if (!result.success) {
    const lines = result.error.issues.map((i) => `  ${i.path.join('.')}: ${i.message}`);
    throw new ConfigError(`Invalid configuration:\n${lines.join('\n')}`);
  }
  return result.data;
}
