import { sql } from 'drizzle-orm';
import { pgTable, uuid, text, timestamp, doublePrecision, uniqueIndex, index, check } from 'drizzle-orm/pg-core';
import { accounts } from '../accounts/accounts.tables';

/** A place a backer chose to keep for sky watch (nothing is stored until they save it). */
export const savedPlaces = pgTable(
  'saved_places',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    accountId: uuid('account_id')
      .notNull()
      .references(() => accounts.id, { onDelete: 'cascade' }),
    name: text('name').notNull(),
    latitudeDeg: doublePrecision('latitude_deg').notNull(),
    longitudeDeg: doublePrecision('longitude_deg').notNull(),
    /** IANA zone the reminder e-mail states its times in (the browser's zone when the place was saved). */
    timeZone: text('time_zone').notNull().default('UTC'),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    uniqueIndex('saved_places_account_name_key').on(t.accountId, sql`lower(${t.name})`),
    check('saved_places_latitude_range', sql`${t.latitudeDeg} between -90 and 90`),
    check('saved_places_longitude_range', sql`${t.longitudeDeg} between -180 and 180`),
  ],
);

/**
 * One reminder e-mail per saved place and pass. `passKey` (place + the pass's highest moment to the minute) is
 * the unique key of the effect; a pass whose time drifted by a newer element set is matched by nearness in
 * the job, under the place's row lock, so it is never reminded twice either.
 */
export const passReminders = pgTable(
  'pass_reminders',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    placeId: uuid('place_id')
      .notNull()
      .references(() => savedPlaces.id, { onDelete: 'cascade' }),
    passKey: text('pass_key').notNull(),
    highestAt: timestamp('highest_at', { withTimezone: true }).notNull(),
    maxElevationDeg: doublePrecision('max_elevation_deg').notNull(),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex('pass_reminders_pass_key_key').on(t.passKey), index('pass_reminders_place_idx').on(t.placeId, t.highestAt)],
);
