import { createHash, randomUUID } from 'node:crypto';
import type { UploadReply } from '../../../shared/schemas/orbit-replies';
import { and, eq, getTableColumns } from 'drizzle-orm';
import type pg from 'pg';
import { pipeline } from 'node:stream/promises';
import { Readable } from 'node:stream';
import { from as copyFrom } from 'pg-copy-streams';
import type { Db } from '../../db/client';
import { isWorkedHere, type JobSender } from '../../jobs/queue';
import { withTransaction } from '../../lib/pg-transaction';
import { recordAudit } from '../audit/audit.repository';
import { parseElementSets } from '../../../shared/orbit/parse-element-sets';
import { detectFormat } from '../../../shared/orbit/detect-format';
import { deriveElementSet } from '../../../shared/orbit/derived';
import type { ParseError, ParseResult } from '../../../shared/orbit/types';
import { tleSlices } from '../../../shared/orbit/tle-parse';
import { binaryCopyChunks, ELEMENT_SET_COPY_COLUMNS, type PreparedSet } from './element-set-copy';
import { binOf, flagOutliers, flagOutliersInTurns, OUTLIER_BIN_MS, type OutlierInput } from './outliers';
import { elementSetFiles, ingestJobs, spacecraft } from './orbit.tables';
import { createUploadWatch } from './upload-watch';
import {
  emptyUpload,
  ingestUnavailable,
  notText,
  unrecognisedFormat,
  uploadNotFound,
  uploadNotReady,
  spacecraftNotFound,
} from './orbit.errors';

type JobRow = Omit<typeof ingestJobs.$inferSelect, 'content'>;

// Every job column but the held file text: polling must not pull megabytes on each request.
const { content: _content, ...jobColumns } = getTableColumns(ingestJobs);
type Logger = { error: (obj: unknown, msg?: string) => void; warn?: (obj: unknown, msg?: string) => void };

/** The queue whose worker previews and imports uploads, and the dead-letter queue that marks an upload failed. */
export const ELEMENT_SET_INGEST_QUEUE = 'element-set-ingest';
export const ELEMENT_SET_INGEST_FAILED_QUEUE = 'element-set-ingest-failed';
export type IngestStep = { uploadId: string; step: 'preview' | 'import'; accountId: string | null };
/** Attempts after the first: a job lost with its worker (or failing on a passing fault) runs again this often. */
export const INGEST_RETRY_LIMIT = 3;

/** How many errors a preview keeps to show (all are counted). */
const PREVIEW_ERRORS = 50;
/** Rows per COPY chunk and per duplicate-check query. */
const INSERT_BATCH = 10_000;
const PARSED_CACHE_MAX = 8;
/** An import of at least this many sets refreshes the table's planner statistics before it commits. */
const ANALYZE_AFTER_SETS = 5_000;

export type { PreparedSet };

export type UploadInput = { spacecraftId: string; accountId: string | null; filename: string; bytes: Buffer };

/** Refuses binary and non-element-set content, from the bytes themselves (never the file name). */
export function decodeUpload(bytes: Buffer): { text: string; format: string } {
  if (bytes.length === 0) throw emptyUpload();
  const nul = bytes.indexOf(0);
  if (nul >= 0) throw notText(`it contains a NUL byte at byte ${nul + 1}`);
  let text: string;
  try {
    text = new TextDecoder('utf-8', { fatal: true }).decode(bytes);
  } catch {
    throw notText('it is not valid UTF-8');
  }
  if (text.trim() === '') throw emptyUpload();
  const format = detectFormat(text);
  if (format === 'unknown') {
    const first = (
      text
        .replace(/^\uFEFF/, '')
        .split('\n')
        .find((l) => l.trim() !== '') ?? ''
    )
      .trim()
      .slice(0, 40);
    throw unrecognisedFormat(first.replace(/[^\x20-\x7e]/g, '?'));
  }
  return { text, format };
}

export function epochKey(catalogNumberInt: number, epochIso: string, elementSetNo: number) {
  return `${catalogNumberInt}|${epochIso}|${elementSetNo}`;
}

/**
 * Counts the records an error list stands for: one two-line set can carry errors on both its lines, so an error
 * on a "2 " line right after an error on its "1 " line is the same record.
 */
function countInvalidRecords(errors: ParseError[], text: string, format: string): number {
  if (errors.length === 0) return 0;
  const lines = [...new Set(errors.map((e) => e.line))].sort((a, b) => a - b);
  if (format !== 'tle') return lines.length;
  const textLines = text.split('\n');
  const starts = (n: number, digit: string) => (textLines[n - 1] ?? '').startsWith(`${digit} `);
  let count = 0;
  for (let k = 0; k < lines.length; k++) {
    const l = lines[k]!;
    const prev = k > 0 ? lines[k - 1]! : -10;
    if (prev === l - 1 && starts(prev, '1') && starts(l, '2')) continue;
    count++;
  }
  return count;
}

type CraftKey = { catalogNumberInt: number; catalogNumber: string; name: string };
export type PreparedUpload = ReturnType<ReturnType<typeof setPreparer>['finish']>;

/**
 * Keeps what parsed pieces of one file hold for `craft`: its sets with their derived orbit (each set once), and every
 * error in line order with the counts. `add` takes the pieces in file order, their line numbers moved on by
 * `lineOffset`; `finish` gets the whole text to count the records the errors stand for.
 */
function setPreparer(craft: CraftKey) {
  const errors: ParseError[] = [];
  const parseErrors: ParseError[] = [];
  let parsedRecords = 0;
  let ownInvalid = 0;
  // Sets already seen in this file, by epoch (the ms its ISO text holds) → element-set number(s). Every set kept here
  // has the craft's catalog number (others are refused below), so epoch + number is the stored key; numbers, not
  // key strings: 100k of those cost more than the rest of this loop.
  const seen = new Map<number, number | Set<number>>();
  const prepared: PreparedSet[] = [];
  let inFileDuplicates = 0;
  const add = (parsed: ParseResult, lineOffset: number) => {
    if (lineOffset) {
      for (const e of parsed.errors) e.line += lineOffset;
      for (const r of parsed.records) {
        r.sourceLine += lineOffset;
        if (r.catalogNumberLine !== undefined) r.catalogNumberLine += lineOffset;
      }
    }
    parsedRecords += parsed.records.length;
    for (const e of parsed.errors) {
      parseErrors.push(e);
      errors.push(e);
    }
    for (const r of parsed.records) {
      if (r.catalogNumberInt !== craft.catalogNumberInt) {
        ownInvalid++;
        // Point at the catalog number itself: an OMM names it on its own line, a named TLE on the line after the name.
        const tle = parsed.format === 'tle';
        errors.push({
          line: r.catalogNumberLine ?? (tle && r.name !== undefined ? r.sourceLine + 1 : r.sourceLine),
          ...(tle ? { columns: [3, 7] as [number, number] } : {}),
          field: tle ? 'catalog number' : 'NORAD_CAT_ID',
          message: `catalog number ${r.catalogNumber} is not ${craft.name}'s (${craft.catalogNumber})`,
          expected: craft.catalogNumber,
          object: { catalogNumber: r.catalogNumber, name: r.name ?? null, internationalDesignator: r.internationalDesignator },
        });
        continue;
      }
      const d = deriveElementSet(r);
      if (!(
        Number.isFinite(d.semiMajorAxisKm) &&
        Number.isFinite(d.apogeeAltitudeKm) &&
        Number.isFinite(d.perigeeAltitudeKm) &&
        d.perigeeAltitudeKm > -6378
      )) {
        ownInvalid++;
        errors.push({
          line: r.sourceLine,
          field: 'mean motion',
          message: 'the elements give no valid orbit',
          expected: 'a mean motion and eccentricity of a closed orbit',
        });
        continue;
      }
      const epochMs = Math.round(r.epochMs);
      const had = seen.get(epochMs);
      if (had === r.elementSetNo || (typeof had === 'object' && had.has(r.elementSetNo))) {
        inFileDuplicates++;
        continue;
      }
      if (had === undefined) seen.set(epochMs, r.elementSetNo);
      else if (typeof had === 'number') seen.set(epochMs, new Set([had, r.elementSetNo]));
      else had.add(r.elementSetNo);
      // The parser's own object takes the derived orbit: copying 100k records into new ones costs more (most of it
      // in garbage collection) than deriving them.
      const set = r as PreparedSet;
      set.semiMajorAxisKm = d.semiMajorAxisKm;
      set.apogeeAltitudeKm = d.apogeeAltitudeKm;
      set.perigeeAltitudeKm = d.perigeeAltitudeKm;
      set.meanAltitudeKm = d.meanAltitudeKm;
      set.periodMin = d.periodMin;
      set.specificEnergyJPerKg = d.specificEnergyJPerKg;
      prepared.push(set);
    }
  };
  const finish = (text: string, format: ParseResult['format']) => {
    const parseInvalid = countInvalidRecords(parseErrors, text, format);
    errors.sort((a, b) => a.line - b.line);
    return {
      format,
      prepared,
      recordCount: parsedRecords + parseInvalid,
      invalidCount: parseInvalid + ownInvalid,
      inFileDuplicates,
      errors,
    };
  };
  return { add, finish };
}

export function prepareSets(text: string, craft: CraftKey) {
  const parsed = parseElementSets(text, { maxErrors: Number.MAX_SAFE_INTEGER });
  const p = setPreparer(craft);
  p.add(parsed, 0);
  return p.finish(text, parsed.format);
}

/** Characters of two-/three-line text parsed in one turn of prepareSetsInTurns (about 2,000 sets). */
const TURN_CHARS = 256 * 1024;
const nextTurn = () => new Promise<void>((resolve) => setImmediate(resolve));

/**
 * prepareSets in turns: two-/three-line text is parsed a piece at a time (tleSlices), giving the event loop back
 * between pieces, so I/O under way (the upload row being written) keeps moving while the file is checked. The same
 * result as prepareSets; other formats are parsed in one turn.
 */
export async function prepareSetsInTurns(text: string, craft: CraftKey, chars = TURN_CHARS): Promise<PreparedUpload> {
  const body = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  if (detectFormat(body) !== 'tle') {
    await nextTurn();
    return prepareSets(text, craft);
  }
  const p = setPreparer(craft);
  for (const piece of tleSlices(text, chars)) {
    await nextTurn();
    p.add(parseElementSets(piece.text, { format: 'tle', maxErrors: Number.MAX_SAFE_INTEGER }), piece.lineOffset);
  }
  return p.finish(text, 'tle');
}

const COPY_COLUMN_NAMES = ELEMENT_SET_COPY_COLUMNS.map(([n]) => n).join(', ');
const INCOMING_COLUMNS = ELEMENT_SET_COPY_COLUMNS.map(([n, t]) => `${n} ${t}`).join(', ');
const INSERT_FROM_INCOMING = `insert into element_sets (spacecraft_id, file_id, ${COPY_COLUMN_NAMES})
    select $1::uuid, $2::uuid, ${COPY_COLUMN_NAMES} from element_sets_incoming
    on conflict (spacecraft_id, catalog_number_int, epoch, element_set_no) do nothing`;

/** The 30-day bins that hold epochs between `fromMs` and `toMs`: [start, end). */
function outlierRange(fromMs: number, toMs: number) {
  return { start: binOf(fromMs) * OUTLIER_BIN_MS, end: (binOf(toMs) + 1) * OUTLIER_BIN_MS };
}

/**
 * The outlier flags an import of `rows` (none of them stored yet) leaves in the bins it touches, from the stored sets
 * around them and the rows themselves, by the same rule as refreshOutliers: which of the rows are outliers, and
 * which stored sets of those bins change flag. Runs in turns, alongside the COPY of the rows.
 */
async function importOutliers(client: pg.PoolClient, spacecraftId: string, rows: readonly PreparedSet[], fromMs: number, toMs: number) {
  const { start, end } = outlierRange(fromMs, toMs);
  const { rows: stored } = await client.query<{ id: string; epoch_ms: number; a: number; p: number; outlier: boolean }>(
    `select id, epoch_ms, semi_major_axis_km as a, perigee_altitude_km as p, outlier from element_sets
      where spacecraft_id = $1 and epoch_ms >= $2 and epoch_ms < $3`,
    [spacecraftId, start - OUTLIER_BIN_MS, end + OUTLIER_BIN_MS],
  );
  // New rows have no id yet: they go in as −1, −2, … (stored ids are positive).
  const input: OutlierInput[] = stored.map((r) => ({
    id: Number(r.id),
    epochMs: r.epoch_ms,
    semiMajorAxisKm: r.a,
    perigeeAltitudeKm: r.p,
  }));
  for (let k = 0; k < rows.length; k++) {
    const r = rows[k]!;
    input.push({ id: -(k + 1), epochMs: r.epochMs, semiMajorAxisKm: r.semiMajorAxisKm, perigeeAltitudeKm: r.perigeeAltitudeKm });
  }
  const flagged = await flagOutliersInTurns(input);
  const newOutliers = rows.filter((_, k) => flagged.has(-(k + 1)));
  const changed = stored.filter((r) => r.epoch_ms >= start && r.epoch_ms < end && flagged.has(Number(r.id)) !== r.outlier);
  return { newOutliers, changed: changed.map((r) => ({ id: r.id, outlier: !r.outlier })) };
}

/** Re-checks the outlier flags of the 30-day bins that hold epochs between `fromMs` and `toMs`. */
export async function refreshOutliers(pool: Pick<pg.Pool, 'query'>, spacecraftId: string, fromMs: number, toMs: number) {
  const { start, end } = outlierRange(fromMs, toMs);
  // One bin either side gives the sets at the edges their neighbours; only the touched bins are written.
  const { rows } = await pool.query<{ id: string; epoch_ms: number; a: number; p: number }>(
    `select id, epoch_ms, semi_major_axis_km as a, perigee_altitude_km as p from element_sets
      where spacecraft_id = $1 and epoch_ms >= $2 and epoch_ms < $3`,
    [spacecraftId, start - OUTLIER_BIN_MS, end + OUTLIER_BIN_MS],
  );
  const flagged = flagOutliers(rows.map((r) => ({ id: Number(r.id), epochMs: r.epoch_ms, semiMajorAxisKm: r.a, perigeeAltitudeKm: r.p })));
  await pool.query(
    `update element_sets set outlier = (id = any($4::bigint[]))
      where spacecraft_id = $1 and epoch_ms >= $2 and epoch_ms < $3 and outlier is distinct from (id = any($4::bigint[]))`,
    [spacecraftId, start, end, [...flagged]],
  );
}

export function jobView(row: JobRow, existingFile?: { id: string; filename: string; uploadedAt: Date } | null): UploadReply {
  return {
    id: row.id,
    spacecraftId: row.spacecraftId,
    status: row.status,
    filename: row.filename,
    byteSize: row.byteSize,
    format: row.format,
    progress: { processed: row.processed, total: row.total },
    counts: { records: row.recordCount, new: row.newCount, duplicate: row.duplicateCount, invalid: row.invalidCount },
    importedCount: row.importedCount,
    errors: row.errors as ParseError[],
    existingFile: existingFile
      ? { id: existingFile.id, filename: existingFile.filename, uploadedAt: existingFile.uploadedAt.toISOString() }
      : null,
    fileId: row.fileId,
    message: row.message,
    createdAt: row.createdAt.toISOString(),
    updatedAt: row.updatedAt.toISOString(),
    version: uploadVersion(row),
  };
}

/** What a status request compares: any write moves updated_at, and status or progress tell apart writes in one ms. */
function uploadVersion(row: Pick<JobRow, 'updatedAt' | 'status' | 'processed'>) {
  return `${row.updatedAt.getTime()}.${row.status}.${row.processed}`;
}
const stillWorking = (status: string) => status === 'parsing' || status === 'importing';
export type JobView = ReturnType<typeof jobView>;

export type IngestServiceDeps = {
  db: Db;
  logger?: Logger;
  /** Where the upload request enqueues the preview and import (a web process built without workers answers 503). */
  jobs?: JobSender;
  /** A worker lost mid-step is replaced after this long (pg-boss expiry); default 900 s. */
  expireInSeconds?: number;
};

/** What this process holds of an upload it received, for its preview: the text's digest and the text checked. */
type HeldUpload = { sha: string; prepared: (craft: CraftKey) => Promise<PreparedUpload | null> };
/**
 * Uploads received by this process whose preview will likely run here (a worker of this process takes ingest jobs),
 * by upload id. Process memory only, a few at most: the stored text stays what a preview elsewhere, or a retry, reads.
 */
const heldHere = new Map<string, HeldUpload>();
// Each holds a text and its parsed sets (tens of MB at 100k sets); a worker previews one upload at a time.
const HELD_MAX = 2;

/** Starts checking an upload's text in turns and keeps it for the preview; resolves when the check is done. */
function holdUpload(id: string, checked: { craft: CraftKey; text: string; sha: string }): Promise<void> {
  const { craft, text, sha } = checked;
  const sameCraft = (c: CraftKey) =>
    c.catalogNumberInt === craft.catalogNumberInt && c.catalogNumber === craft.catalogNumber && c.name === craft.name;
  const done = prepareSetsInTurns(text, craft).then(
    (r) => r,
    () => null,
  );
  heldHere.set(id, {
    sha,
    // The craft may have been edited since the upload: then the held text is checked again for it.
    prepared: async (c) => ((await done) && sameCraft(c) ? done : prepareSets(text, c)),
  });
  while (heldHere.size > HELD_MAX) heldHere.delete(heldHere.keys().next().value!);
  return done.then(() => undefined);
}

export function createIngestService({ db, jobs, logger, expireInSeconds = 900 }: IngestServiceDeps) {
  // The bulk statements use the pool drizzle was built on.
  const pool = (db as unknown as { $client: pg.Pool }).$client;
  const uploadWatch = createUploadWatch(pool, { warn: (obj: unknown, msg?: string) => logger?.warn?.(obj, msg) });
  // What a preview prepared, for the import that usually follows on the same worker (a retry or another worker re-parses).
  const parsedCache = new Map<string, PreparedSet[]>();

  function remember(jobId: string, rows: PreparedSet[]) {
    parsedCache.set(jobId, rows);
    while (parsedCache.size > PARSED_CACHE_MAX) parsedCache.delete(parsedCache.keys().next().value!);
  }

  const sendOptions = () => ({
    expireInSeconds,
    retryLimit: INGEST_RETRY_LIMIT,
    retryDelay: 1,
    retryBackoff: true,
    deadLetter: ELEMENT_SET_INGEST_FAILED_QUEUE,
  });

  /** Progress rows written in order on their own connections (visible while the import's transaction is open). */
  function progressWriter(jobId: string) {
    let chain: Promise<unknown> = Promise.resolve();
    return {
      /** The import's total (the progress bar's end), ahead of its counts, without waiting for it. */
      start(total: number) {
        chain = chain.then(() =>
          pool
            .query('update orbit_ingest_jobs set total = $2, processed = 0, updated_at = now() where id = $1', [jobId, total])
            .catch(() => undefined),
        );
      },
      report(n: number) {
        chain = chain.then(() =>
          pool
            .query('update orbit_ingest_jobs set processed = $2, updated_at = now() where id = $1 and processed < $2', [jobId, n])
            .catch(() => undefined),
        );
      },
      settled: () => chain,
    };
  }

  async function loadCraft(spacecraftId: string) {
    const [craft] = await db.select().from(spacecraft).where(eq(spacecraft.id, spacecraftId));
    if (!craft) throw spacecraftNotFound();
    return craft;
  }

  async function runPreview(jobId: string) {
    const [held] = await db
      .select({ status: ingestJobs.status, spacecraftId: ingestJobs.spacecraftId, contentSha256: ingestJobs.contentSha256 })
      .from(ingestJobs)
      .where(eq(ingestJobs.id, jobId));
    const early = heldHere.get(jobId);
    heldHere.delete(jobId);
    // Gone (its craft deleted), or previewed by an earlier attempt: nothing to do.
    if (!held || held.status !== 'parsing') return;
    const craft = await loadCraft(held.spacecraftId);
    let result = early && early.sha === held.contentSha256 ? await early.prepared(craft) : null;
    if (!result) {
      const [stored] = await db.select({ content: ingestJobs.content }).from(ingestJobs).where(eq(ingestJobs.id, jobId));
      result = prepareSets(stored?.content ?? '', craft);
    }
    const total = result.prepared.length;
    // Count what the history already holds, in batches so progress moves on large files.
    let stored = 0;
    const fresh: PreparedSet[] = [];
    let lo = Infinity,
      hi = -Infinity;
    for (const r of result.prepared) {
      if (r.epochMs < lo) lo = r.epochMs;
      if (r.epochMs > hi) hi = r.epochMs;
    }
    // A file that does not overlap the stored history in time cannot hold a stored set: skip the per-set lookups.
    const { rows: overlap } = total
      ? await pool.query<{ n: number }>(
          'select count(*)::int as n from element_sets where spacecraft_id = $1 and epoch_ms >= $2 and epoch_ms <= $3',
          [craft.id, lo - 1, hi + 1],
        )
      : { rows: [{ n: 0 }] };
    if (!overlap[0]?.n) for (const r of result.prepared) fresh.push(r);
    // The lookups below report their progress; without them the preview's last write says it all.
    else await pool.query('update orbit_ingest_jobs set total = $2, processed = 0, updated_at = now() where id = $1', [jobId, total]);
    for (let i = 0; overlap[0]?.n && i < total; i += INSERT_BATCH) {
      const chunk = result.prepared.slice(i, i + INSERT_BATCH);
      // Which of the chunk's sets are stored, by their place in the chunk: no key text to build and compare per set.
      const { rows } = await pool.query<{ i: string }>(
        `select k.i from element_sets e
           join unnest($3::timestamptz[], $4::int4[]) with ordinality as k(epoch, no, i) on e.epoch = k.epoch and e.element_set_no = k.no
          where e.spacecraft_id = $1 and e.catalog_number_int = $2`,
        [craft.id, craft.catalogNumberInt, chunk.map((r) => r.epoch), chunk.map((r) => r.elementSetNo)],
      );
      const have = new Uint8Array(chunk.length);
      for (const r of rows) have[Number(r.i) - 1] = 1;
      for (let k = 0; k < chunk.length; k++) {
        if (have[k]) stored++;
        else fresh.push(chunk[k]!);
      }
      await pool.query('update orbit_ingest_jobs set processed = $2, updated_at = now() where id = $1', [
        jobId,
        Math.min(total, i + chunk.length),
      ]);
    }
    remember(jobId, fresh);
    await db
      .update(ingestJobs)
      .set({
        status: 'previewed',
        format: result.format,
        recordCount: result.recordCount,
        newCount: fresh.length,
        duplicateCount: stored + result.inFileDuplicates,
        invalidCount: result.invalidCount,
        errors: result.errors.slice(0, PREVIEW_ERRORS),
        processed: total,
        total,
        message: previewMessage(fresh.length, stored + result.inFileDuplicates, result.invalidCount),
        updatedAt: new Date(),
      })
      .where(and(eq(ingestJobs.id, jobId), eq(ingestJobs.status, 'parsing')));
  }

  async function runImport(jobId: string, accountId: string | null) {
    const [job] = await db.select(jobColumns).from(ingestJobs).where(eq(ingestJobs.id, jobId));
    // Imported (or cancelled) already: a retry after the commit changes nothing.
    if (!job || job.status !== 'importing') return;
    const craft = await loadCraft(job.spacecraftId);
    let rows = parsedCache.get(job.id);
    parsedCache.delete(job.id);
    if (!rows) {
      const [held] = await db.select({ content: ingestJobs.content }).from(ingestJobs).where(eq(ingestJobs.id, job.id));
      rows = prepareSets(held?.content ?? '', craft).prepared;
    }
    if (rows.length === 0) {
      // Nothing new to store: no file row either, so an all-invalid or already-stored upload leaves no trace but the job.
      await db
        .update(ingestJobs)
        .set({
          status: 'imported',
          importedCount: 0,
          content: null,
          fileId: job.existingFileId,
          message: importMessage(0, job.duplicateCount),
          updatedAt: new Date(),
        })
        .where(and(eq(ingestJobs.id, job.id), eq(ingestJobs.status, 'importing')));
      return;
    }
    let lo = Infinity,
      hi = -Infinity;
    for (const r of rows) {
      if (r.epochMs < lo) lo = r.epochMs;
      if (r.epochMs > hi) hi = r.epochMs;
    }
    const client = await pool.connect();
    let imported = 0;
    let fileId: string;
    const progressRows = progressWriter(job.id);
    try {
      await client.query('begin');
      // A large import on a busy database outlasts the pool's per-statement limit (meant for requests); the job's own
      // expiry bounds it instead.
      await client.query(`set local statement_timeout = ${Math.round(expireInSeconds * 1000)}`);
      // One import per spacecraft at a time: the outlier flags below are worked out from the stored sets around the
      // new ones, which must not change under them. A concurrent import of the same bytes waits here, then reuses the file row.
      await client.query('select pg_advisory_xact_lock(hashtext($1))', [`element_sets:${craft.id}`]);
      // The job row turns "imported" in this same transaction: an attempt that waited here behind one that finished
      // the same job (a worker given up for lost, still running) finds it done and stores nothing.
      const { rows: now } = await client.query<{ status: string }>('select status from orbit_ingest_jobs where id = $1', [job.id]);
      if (now[0]?.status !== 'importing') {
        await client.query('commit');
        return;
      }
      // One row per distinct file content.
      // The original text moves from the job row to the file row inside the database, not through this process again.
      const ins = await client.query<{ id: string }>(
        `insert into element_set_files (spacecraft_id, content_sha256, filename, format, byte_size, content, record_count, imported_count, duplicate_count, invalid_count, uploaded_by)
         select $1, $2, $3, $4, $5, coalesce(j.content, ''), $6, 0, $7, $8, $9 from orbit_ingest_jobs j where j.id = $10
         on conflict (spacecraft_id, content_sha256) do nothing returning id`,
        [
          craft.id,
          job.contentSha256,
          job.filename,
          job.format ?? 'unknown',
          job.byteSize,
          job.recordCount,
          job.duplicateCount,
          job.invalidCount,
          job.createdBy,
          job.id,
        ],
      );
      const newFile = ins.rows.length > 0;
      if (newFile) fileId = ins.rows[0]!.id;
      else {
        const { rows: ex } = await client.query<{ id: string }>(
          'select id from element_set_files where spacecraft_id = $1 and content_sha256 = $2',
          [craft.id, job.contentSha256],
        );
        fileId = ex[0]!.id;
      }
      progressRows.start(rows.length);
      const progress = (n: number) => progressRows.report(n);
      // The outlier screen of the touched bins runs in turns while the COPY streams (the database does most of
      // that work), so the rows go in once, unflagged, and only the few outliers are marked after.
      // (Its SELECT is queued on this client ahead of the COPY; the settled form keeps a failure from going unhandled.)
      const outliers = importOutliers(client, craft.id, rows, lo, hi).then(
        (value) => ({ value }),
        (error: unknown) => ({ error }),
      );
      // Straight COPY into the table first. Should any set be there already (a concurrent import of the same
      // file won the race), the unique key refuses the COPY; then COPY into a scratch table and
      // INSERT … ON CONFLICT DO NOTHING. Either way the key, not this code, keeps every set single.
      await client.query('savepoint direct_copy');
      let direct = true;
      try {
        const copy = client.query(
          copyFrom(`copy element_sets (spacecraft_id, file_id, ${COPY_COLUMN_NAMES}) from stdin with (format binary)`),
        );
        await pipeline(
          Readable.from(binaryCopyChunks(rows, { ids: { spacecraftId: craft.id, fileId }, progressEvery: INSERT_BATCH, onRows: progress })),
          copy,
        );
        await client.query('release savepoint direct_copy');
        imported = rows.length;
      } catch (err) {
        if ((err as { code?: string }).code !== '23505') throw err;
        direct = false;
        await client.query('rollback to savepoint direct_copy');
        await client.query(`create temp table element_sets_incoming (${INCOMING_COLUMNS}) on commit drop`);
        const copy = client.query(copyFrom(`copy element_sets_incoming from stdin with (format binary)`));
        await pipeline(Readable.from(binaryCopyChunks(rows, { progressEvery: INSERT_BATCH, onRows: progress })), copy);
        const res = await client.query(INSERT_FROM_INCOMING, [craft.id, fileId]);
        imported = res.rowCount ?? 0;
      }
      const screen = await outliers;
      if ('error' in screen) throw screen.error;
      const { newOutliers, changed } = screen.value;
      if (direct) {
        // Every row went in: mark the new outliers (by the unique key) and the stored sets whose flag changed.
        if (newOutliers.length) {
          await client.query(
            `update element_sets e set outlier = true from unnest($3::timestamptz[], $4::int4[]) as k(epoch, no)
              where e.spacecraft_id = $1 and e.catalog_number_int = $2 and e.epoch = k.epoch and e.element_set_no = k.no`,
            [craft.id, craft.catalogNumberInt, newOutliers.map((r) => r.epoch), newOutliers.map((r) => r.elementSetNo)],
          );
        }
        if (changed.length) {
          await client.query(
            'update element_sets e set outlier = k.outlier from unnest($1::bigint[], $2::bool[]) as k(id, outlier) where e.id = k.id',
            [changed.map((c) => c.id), changed.map((c) => c.outlier)],
          );
        }
      } else if (imported > 0) {
        // Some rows were stored already, so the screen above counted them twice: redo it from the table.
        await refreshOutliers(client, craft.id, lo, hi);
      }
      if (newFile) {
        await client.query('update element_set_files set imported_count = $2, duplicate_count = $3 where id = $1', [
          fileId,
          imported,
          job.duplicateCount + (rows.length - imported),
        ]);
      }
      await client.query(
        `insert into audit_log (actor_id, action, subject_type, subject_id, after) values ($1, 'element_sets.imported', 'element_set_file', $2, $3)`,
        [
          accountId,
          fileId,
          JSON.stringify({ jobId: job.id, filename: job.filename, imported, duplicates: job.duplicateCount + (rows.length - imported) }),
        ],
      );
      // The last progress row lands before this transaction takes the job row (it would wait for the commit).
      await progressRows.settled();
      await client.query(
        `update orbit_ingest_jobs set status = 'imported', imported_count = $2, file_id = $3, content = null, processed = $4,
                message = $5, updated_at = now() where id = $1`,
        [job.id, imported, fileId, rows.length, importMessage(imported, job.duplicateCount + (rows.length - imported))],
      );
      // After a bulk load the planner's statistics still describe the table before it (common practice: ANALYZE
      // after a large load). Without this the trend view of a freshly imported large history could pick a plan
      // that ran into the statement timeout. In this transaction, so "imported" is seen with fresh statistics.
      // Only the columns the orbit queries filter, join and sort on, from a small sample: what the planner needs
      // to see the table's new size and spread. A full ANALYZE samples 30,000 rows of all 31 columns and took
      // 0.75 s at 400,000 rows on this machine; this one 0.03 s. A later analyze (autovacuum's, after more
      // changes) refines it.
      if (imported >= ANALYZE_AFTER_SETS) {
        await client.query('set local default_statistics_target = 10');
        await client.query('analyze element_sets (spacecraft_id, file_id, epoch, epoch_ms, outlier)');
      }
      await client.query('commit');
    } catch (err) {
      await client.query('rollback').catch(() => undefined);
      throw err;
    } finally {
      client.release();
    }
  }

  async function getRow(jobId: string): Promise<JobRow> {
    const [row] = await db.select(jobColumns).from(ingestJobs).where(eq(ingestJobs.id, jobId));
    if (!row) throw uploadNotFound();
    return row;
  }

  async function view(row: JobRow): Promise<JobView> {
    let existing: { id: string; filename: string; uploadedAt: Date } | null = null;
    if (row.existingFileId) {
      const [f] = await db
        .select({ id: elementSetFiles.id, filename: elementSetFiles.filename, uploadedAt: elementSetFiles.uploadedAt })
        .from(elementSetFiles)
        .where(eq(elementSetFiles.id, row.existingFileId));
      existing = f ?? null;
    }
    return jobView(row, existing);
  }

  /** The upload's craft, its text (refused unless element sets in UTF-8) and the digest of its bytes. */
  async function checkUpload(input: UploadInput) {
    const craft = await loadCraft(input.spacecraftId);
    const { text, format } = decodeUpload(input.bytes);
    const sha = createHash('sha256').update(input.bytes).digest('hex');
    return { craft, text, format, sha };
  }

  /** Writes the upload row, holding the text, in the caller's transaction: the row is what the worker reads. */
  async function insertUpload(tx: Db, input: UploadInput, checked: Awaited<ReturnType<typeof checkUpload>>, id?: string) {
    const { craft, text, format, sha } = checked;
    const [existing] = await tx
      .select({ id: elementSetFiles.id })
      .from(elementSetFiles)
      .where(and(eq(elementSetFiles.spacecraftId, craft.id), eq(elementSetFiles.contentSha256, sha)));
    const [row] = await tx
      .insert(ingestJobs)
      .values({
        ...(id ? { id } : {}),
        spacecraftId: craft.id,
        createdBy: input.accountId,
        status: 'parsing',
        filename: input.filename.slice(0, 200) || 'pasted.txt',
        byteSize: input.bytes.length,
        contentSha256: sha,
        content: text,
        format,
        existingFileId: existing?.id ?? null,
      })
      .returning(jobColumns);
    return row!;
  }

  const service = {
    /**
     * Stores the upload (its text on the job row) and enqueues its preview in one transaction; nothing goes into
     * element_sets. A worker parses it; the client polls getJob for progress.
     */
    async startUpload(input: UploadInput): Promise<JobView> {
      if (!jobs) throw ingestUnavailable();
      const checked = await checkUpload(input);
      const id = randomUUID();
      // When this process's own worker will preview the upload, the text is checked here while its row is written
      // (the database does that work), and both are handed to the preview: it then neither reads the text back nor
      // parses it again. Elsewhere (or on a retry) the preview reads the stored text.
      const early = isWorkedHere(ELEMENT_SET_INGEST_QUEUE) ? holdUpload(id, checked) : null;
      try {
        const row = await withTransaction(pool, async (tx, executor) => {
          const row = await insertUpload(tx, input, checked, id);
          const step: IngestStep = { uploadId: row.id, step: 'preview', accountId: input.accountId };
          await jobs.send(ELEMENT_SET_INGEST_QUEUE, step, { db: executor, ...sendOptions() });
          return row;
        });
        await early;
        return view(row);
      } catch (err) {
        heldHere.delete(id);
        throw err;
      }
    },

    /**
     * The upload as it is now; with `after` (a version the caller holds) and the upload still being worked on, the
     * answer waits until it changes (or `waitMs` passes, or `signal` aborts): the status page gets each change as it
     * lands, without asking over and over.
     */
    async getJob(jobId: string, opts: { after?: string; waitMs?: number; signal?: AbortSignal } = {}): Promise<JobView> {
      if (opts.after === undefined) return view(await getRow(jobId));
      const watching = await uploadWatch.watch(jobId, opts.waitMs ?? 25_000, opts.signal);
      try {
        const row = await getRow(jobId);
        if (uploadVersion(row) !== opts.after || !stillWorking(row.status)) return view(row);
        await watching.changed;
        return view(await getRow(jobId));
      } finally {
        watching.done();
      }
    },

    /** Enqueues the import of a previewed upload (the worker stores every new set in one transaction, or none). */
    async importUpload(jobId: string, accountId: string | null): Promise<JobView> {
      if (!jobs) throw ingestUnavailable();
      const current = await getRow(jobId);
      const row = await withTransaction(pool, async (tx, executor) => {
        // Only one caller moves a previewed job on; a second click or request finds it no longer previewed.
        const [row] = await tx
          .update(ingestJobs)
          .set({ status: 'importing', processed: 0, updatedAt: new Date() })
          .where(and(eq(ingestJobs.id, jobId), eq(ingestJobs.status, 'previewed')))
          .returning(jobColumns);
        if (!row) throw uploadNotReady(current.status);
        const step: IngestStep = { uploadId: jobId, step: 'import', accountId };
        await jobs.send(ELEMENT_SET_INGEST_QUEUE, step, { db: executor, ...sendOptions() });
        return row;
      });
      return view(row);
    },

    async cancelUpload(jobId: string, accountId: string | null): Promise<JobView> {
      const current = await getRow(jobId);
      const [row] = await db
        .update(ingestJobs)
        .set({ status: 'cancelled', content: null, message: 'Cancelled: nothing was imported.', updatedAt: new Date() })
        .where(and(eq(ingestJobs.id, jobId), eq(ingestJobs.status, 'previewed')))
        .returning(jobColumns);
      if (!row) throw uploadNotReady(current.status);
      parsedCache.delete(jobId);
      await recordAudit(db, {
        actorId: accountId,
        action: 'element_sets.upload_cancelled',
        subjectType: 'ingest_job',
        subjectId: jobId,
        after: { filename: row.filename },
      });
      return view(row);
    },

    /** The worker's part (server/jobs/element-set-ingest.ts): idempotent, so a retried or repeated step changes nothing twice. */
    async runStep({ uploadId, step, accountId }: IngestStep): Promise<void> {
      if (step === 'preview') await runPreview(uploadId);
      else await runImport(uploadId, accountId);
    },

    /** Every attempt of a step failed (or its workers were lost every time): the upload says so and lets go of its text. */
    async markFailed({ uploadId, step }: IngestStep): Promise<void> {
      parsedCache.delete(uploadId);
      await withTransaction(pool, async (tx, executor) => {
        // An attempt given up for lost may still be importing for this craft (it holds the craft's lock): the upload is
        // not failed while it runs. Throwing hands this job back to its queue, to look again later.
        if (step === 'import') {
          const { rows } = await executor.executeSql(
            `select pg_try_advisory_xact_lock(hashtext('element_sets:' || spacecraft_id::text)) as free from orbit_ingest_jobs where id = $1`,
            [uploadId],
          );
          if ((rows[0] as { free?: boolean } | undefined)?.free === false) throw new Error('an import for this craft is still running');
        }
        await tx
          .update(ingestJobs)
          .set({
            status: 'failed',
            content: null,
            message:
              step === 'preview'
                ? 'The file could not be checked on our side, so nothing was stored. Upload it again; if it fails again, report it.'
                : 'The import failed on our side and nothing was stored. Upload the file again; if it fails again, report it.',
            updatedAt: new Date(),
          })
          .where(and(eq(ingestJobs.id, uploadId), eq(ingestJobs.status, step === 'preview' ? 'parsing' : 'importing')));
      });
    },

    /** Upload, preview and import in this process, one after the other — the demo seed and scripts (no queue). */
    async ingestText(input: { spacecraftId: string; accountId: string | null; filename: string; text: string }) {
      const bytes = Buffer.from(input.text, 'utf8');
      const row = await insertUpload(db, { ...input, bytes }, await checkUpload({ ...input, bytes }));
      await runPreview(row.id);
      const [previewed] = await db
        .update(ingestJobs)
        .set({ status: 'importing', processed: 0, updatedAt: new Date() })
        .where(and(eq(ingestJobs.id, row.id), eq(ingestJobs.status, 'previewed')))
        .returning({ id: ingestJobs.id });
      if (previewed) await runImport(row.id, input.accountId);
      return service.getJob(row.id);
    },
  };

  return service;
}

export type IngestService = ReturnType<typeof createIngestService>;

function plural(n: number, one: string, many = `${one}s`) {
  return `${n.toLocaleString('en-GB')} ${n === 1 ? one : many}`;
}

export function previewMessage(fresh: number, duplicates: number, invalid: number): string {
  if (fresh === 0 && duplicates > 0 && invalid === 0)
    return duplicates === 1
      ? 'Nothing new: the one element set is already stored.'
      : `Nothing new: all ${plural(duplicates, 'element set')} are already stored.`;
  if (fresh === 0 && duplicates === 0) return `No valid element sets: ${plural(invalid, 'invalid record')}. Nothing can be imported.`;
  return `${plural(fresh, 'new element set')} ready to import; ${plural(duplicates, 'duplicate')} and ${plural(invalid, 'invalid record')} will be skipped.`;
}

export function importMessage(imported: number, duplicates: number): string {
  if (imported === 0 && duplicates === 0) return 'Nothing imported: the file held no valid element sets.';
  if (imported === 0)
    return duplicates === 1
      ? 'Nothing imported: the one element set was already stored.'
      : `Nothing imported: all ${plural(duplicates, 'element set')} were already stored.`;
  return `Imported ${plural(imported, 'element set')}${duplicates ? `; skipped ${plural(duplicates, 'duplicate')}` : ''}.`;
}
