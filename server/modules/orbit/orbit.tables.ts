import { sql } from 'drizzle-orm';
import {
  pgTable,
  uuid,
  text,
  timestamp,
  doublePrecision,
  integer,
  bigserial,
  boolean,
  jsonb,
  uniqueIndex,
  index,
  pgEnum,
  date,
  check,
} from 'drizzle-orm/pg-core';
import { accounts } from '../accounts/accounts.tables';

export const spacecraft = pgTable(
  'spacecraft',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    /** Stable public handle, e.g. "tern-1" (public orbit summary URL). */
    slug: text('slug').notNull(),
    name: text('name').notNull(),
    /** Five characters as in a TLE (digits or alpha-5). */
    catalogNumber: text('catalog_number').notNull(),
    catalogNumberInt: integer('catalog_number_int').notNull(),
    internationalDesignator: text('international_designator').notNull().default(''),
    massKg: doublePrecision('mass_kg').notNull(),
    sailAreaM2: doublePrecision('sail_area_m2').notNull(),
    sailReflectivity: doublePrecision('sail_reflectivity').notNull(),
    dragCoefficient: doublePrecision('drag_coefficient').notNull(),
    dragAreaEdgeOnM2: doublePrecision('drag_area_edge_on_m2').notNull(),
    launchDate: date('launch_date'),
    sailDeployedAt: timestamp('sail_deployed_at', { withTimezone: true }),
    /** The mission's own craft: the desk, the public pages and snapshots default to it. At most one (index below). */
    isMissionCraft: boolean('is_mission_craft').notNull().default(false),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    uniqueIndex('spacecraft_slug_key').on(t.slug),
    uniqueIndex('spacecraft_catalog_key').on(t.catalogNumberInt),
    uniqueIndex('spacecraft_one_mission_craft')
      .on(t.isMissionCraft)
      .where(sql`${t.isMissionCraft}`),
    // A comparison object may have no sail: area 0.
    check('spacecraft_sail_area_not_negative', sql`${t.sailAreaM2} >= 0`),
  ],
);

export const elementSetFiles = pgTable(
  'element_set_files',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    spacecraftId: uuid('spacecraft_id')
      .notNull()
      .references(() => spacecraft.id, { onDelete: 'cascade' }),
    contentSha256: text('content_sha256').notNull(),
    filename: text('filename').notNull(),
    format: text('format').notNull(),
    byteSize: integer('byte_size').notNull(),
    /** The original file as uploaded (UTF-8 text; binary uploads are refused). */
    content: text('content').notNull(),
    recordCount: integer('record_count').notNull(),
    importedCount: integer('imported_count').notNull(),
    duplicateCount: integer('duplicate_count').notNull(),
    invalidCount: integer('invalid_count').notNull(),
    uploadedBy: uuid('uploaded_by').references(() => accounts.id, { onDelete: 'set null' }),
    uploadedAt: timestamp('uploaded_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex('element_set_files_hash_key').on(t.spacecraftId, t.contentSha256)],
);

export const elementSets = pgTable(
  'element_sets',
  {
    id: bigserial('id', { mode: 'number' }).primaryKey(),
    spacecraftId: uuid('spacecraft_id')
      .notNull()
      .references(() => spacecraft.id, { onDelete: 'cascade' }),
    fileId: uuid('file_id')
      .notNull()
      .references(() => elementSetFiles.id, { onDelete: 'restrict' }),
    sourceLine: integer('source_line').notNull(),
    catalogNumberInt: integer('catalog_number_int').notNull(),
    epoch: timestamp('epoch', { withTimezone: true, precision: 6 }).notNull(),
    /** Unix ms with the sub-millisecond fraction the set carries. */
    epochMs: doublePrecision('epoch_ms').notNull(),
    elementSetNo: integer('element_set_no').notNull(),
    classification: text('classification').notNull(),
    internationalDesignator: text('international_designator').notNull(),
    meanMotionRevPerDay: doublePrecision('mean_motion_rev_per_day').notNull(),
    meanMotionDotRevPerDay2: doublePrecision('mean_motion_dot_rev_per_day2').notNull(),
    meanMotionDdotRevPerDay3: doublePrecision('mean_motion_ddot_rev_per_day3').notNull(),
    bstar: doublePrecision('bstar').notNull(),
    inclinationDeg: doublePrecision('inclination_deg').notNull(),
    raanDeg: doublePrecision('raan_deg').notNull(),
    eccentricity: doublePrecision('eccentricity').notNull(),
    argPerigeeDeg: doublePrecision('arg_perigee_deg').notNull(),
    meanAnomalyDeg: doublePrecision('mean_anomaly_deg').notNull(),
    revAtEpoch: integer('rev_at_epoch').notNull(),
    line1: text('line1').notNull(),
    line2: text('line2').notNull(),
    semiMajorAxisKm: doublePrecision('semi_major_axis_km').notNull(),
    apogeeAltitudeKm: doublePrecision('apogee_altitude_km').notNull(),
    perigeeAltitudeKm: doublePrecision('perigee_altitude_km').notNull(),
    meanAltitudeKm: doublePrecision('mean_altitude_km').notNull(),
    periodMin: doublePrecision('period_min').notNull(),
    specificEnergyJPerKg: doublePrecision('specific_energy_j_per_kg').notNull(),
    /** Kept up to date by each import (server/modules/orbit/outliers.ts). */
    outlier: boolean('outlier').notNull().default(false),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    // The database, not only the code, keeps one row per set: object + epoch + element-set number.
    uniqueIndex('element_sets_object_epoch_no_key').on(t.spacecraftId, t.catalogNumberInt, t.epoch, t.elementSetNo),
    index('element_sets_spacecraft_epoch_idx').on(t.spacecraftId, t.epoch),
    index('element_sets_file_idx').on(t.fileId),
    // Also, by hand (drizzle/0019_trend-covering-index.sql, INCLUDE is beyond drizzle-kit): element_sets_trend_idx on
    // (spacecraft_id, epoch_ms) covering the trend's columns, and element_sets_outlier_idx for the outliers.
  ],
);

export const ingestStatusEnum = pgEnum('orbit_ingest_status', ['parsing', 'previewed', 'importing', 'imported', 'cancelled', 'failed']);

/** One upload's life: parsed into a preview (nothing stored in element_sets), then imported or cancelled. */
export const ingestJobs = pgTable(
  'orbit_ingest_jobs',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    spacecraftId: uuid('spacecraft_id')
      .notNull()
      .references(() => spacecraft.id, { onDelete: 'cascade' }),
    createdBy: uuid('created_by').references(() => accounts.id, { onDelete: 'set null' }),
    status: ingestStatusEnum('status').notNull(),
    filename: text('filename').notNull(),
    byteSize: integer('byte_size').notNull(),
    contentSha256: text('content_sha256').notNull(),
    /** Held until import or cancel, then cleared (the file row keeps the original). */
    content: text('content'),
    format: text('format'),
    processed: integer('processed').notNull().default(0),
    total: integer('total').notNull().default(0),
    recordCount: integer('record_count').notNull().default(0),
    newCount: integer('new_count').notNull().default(0),
    duplicateCount: integer('duplicate_count').notNull().default(0),
    invalidCount: integer('invalid_count').notNull().default(0),
    importedCount: integer('imported_count'),
    /** The first errors, with line numbers. */
    errors: jsonb('errors')
      .notNull()
      .default(sql`'[]'::jsonb`),
    /** A file with the same content already stored for this spacecraft. */
    existingFileId: uuid('existing_file_id').references(() => elementSetFiles.id, { onDelete: 'set null' }),
    fileId: uuid('file_id').references(() => elementSetFiles.id, { onDelete: 'set null' }),
    message: text('message'),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index('orbit_ingest_jobs_spacecraft_idx').on(t.spacecraftId, t.createdAt)],
);

export const sailModeEnum = pgEnum('sail_mode', ['raising', 'edge-on', 'tumbling', 'unknown']);

export const sailingPeriods = pgTable(
  'sailing_periods',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    spacecraftId: uuid('spacecraft_id')
      .notNull()
      .references(() => spacecraft.id, { onDelete: 'cascade' }),
    startAt: timestamp('start_at', { withTimezone: true }).notNull(),
    endAt: timestamp('end_at', { withTimezone: true }).notNull(),
    mode: sailModeEnum('mode').notNull(),
    note: text('note').notNull().default(''),
    createdBy: uuid('created_by').references(() => accounts.id, { onDelete: 'set null' }),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    index('sailing_periods_spacecraft_idx').on(t.spacecraftId, t.startAt),
    check('sailing_periods_order', sql`${t.endAt} > ${t.startAt}`),
  ],
);

export const snapshots = pgTable(
  'snapshots',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    /** Stable public handle: set once at creation, kept through renames and publish toggles. */
    slug: text('slug').notNull(),
    spacecraftId: uuid('spacecraft_id')
      .notNull()
      .references(() => spacecraft.id, { onDelete: 'cascade' }),
    ownerId: uuid('owner_id').references(() => accounts.id, { onDelete: 'set null' }),
    title: text('title').notNull(),
    caption: text('caption').notNull().default(''),
    isPublic: boolean('is_public').notNull().default(false),
    /** The frozen chart: points, window, series, annotations, rates (see shared/charts/snapshot-chart.ts). */
    data: jsonb('data').notNull(),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex('snapshots_slug_key').on(t.slug), index('snapshots_owner_idx').on(t.ownerId, t.createdAt)],
);
