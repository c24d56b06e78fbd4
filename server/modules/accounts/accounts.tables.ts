import { sql } from 'drizzle-orm';
import { pgTable, uuid, text, timestamp, boolean, primaryKey, uniqueIndex, index, pgEnum } from 'drizzle-orm/pg-core';

export const roleEnum = pgEnum('role', ['backer', 'outreach', 'engineer', 'finance', 'admin']);

export const accounts = pgTable(
  'accounts',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    email: text('email').notNull(),
    displayName: text('display_name').notNull(),
    emailVerifiedAt: timestamp('email_verified_at', { withTimezone: true }),
    deletedAt: timestamp('deleted_at', { withTimezone: true }),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex('accounts_email_lower_key').on(sql`lower(${t.email})`)],
);

export const identities = pgTable(
  'identities',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    accountId: uuid('account_id')
      .notNull()
      .references(() => accounts.id, { onDelete: 'cascade' }),
    // 'password' (passwordHash set) or an external provider such as 'google' (subject set).
    provider: text('provider').notNull(),
    subject: text('subject'),
    passwordHash: text('password_hash'),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex('identities_provider_subject_key').on(t.provider, t.subject), index('identities_account_idx').on(t.accountId)],
);

export const accountRoles = pgTable(
  'account_roles',
  {
    accountId: uuid('account_id')
      .notNull()
      .references(() => accounts.id, { onDelete: 'cascade' }),
    role: roleEnum('role').notNull(),
    grantedAt: timestamp('granted_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [primaryKey({ columns: [t.accountId, t.role] })],
);

export const authTokens = pgTable('auth_tokens', {
  id: uuid('id').primaryKey().defaultRandom(),
  accountId: uuid('account_id')
    .notNull()
    .references(() => accounts.id, { onDelete: 'cascade' }),
  purpose: text('purpose').notNull(), // 'verify-email' | 'reset-password'
  tokenHash: text('token_hash').notNull().unique(),
  expiresAt: timestamp('expires_at', { withTimezone: true }).notNull(),
  usedAt: timestamp('used_at', { withTimezone: true }),
  createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
});

export const emailPreferences = pgTable('email_preferences', {
  accountId: uuid('account_id')
    .primaryKey()
    .references(() => accounts.id, { onDelete: 'cascade' }),
  dispatches: boolean('dispatches').notNull().default(true),
  receipts: boolean('receipts').notNull().default(true),
  membership: boolean('membership').notNull().default(true),
  /** Reminder e-mails before good passes over saved places: off until the backer turns them on. */
  passReminders: boolean('pass_reminders').notNull().default(false),
  updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
});
