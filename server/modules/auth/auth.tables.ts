import { pgTable, varchar, json, timestamp, index } from 'drizzle-orm/pg-core';

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
