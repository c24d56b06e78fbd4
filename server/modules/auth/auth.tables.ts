import { pgTable, varchar, json, timestamp, index, text, integer } from 'drizzle-orm/pg-core';

// The table connect-pg-simple reads and writes (its documented shape), created by our migrations.
export const sessions = pgTable(
  'session',
  {
    sid: varchar('sid').primaryKey(),
    sess: json('sess').notNull(),
    expire: timestamp('expire', { precision: 6 }).notNull(),
  },
  (t) => [index('IDX_session_expire').on(t.expire)],
);

// Rate-limit counters shared by every app process (express-rate-limit store in PostgreSQL).
export const rateLimitHits = pgTable('rate_limit_hits', {
  key: text('key').primaryKey(),
  hits: integer('hits').notNull(),
  resetAt: timestamp('reset_at', { withTimezone: true }).notNull(),
});
