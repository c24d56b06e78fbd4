import type { ElementSet } from '../../../shared/orbit/types';
import type { OrbitSummary } from '../../../shared/orbit/derived';

/** An element set ready to store: the parsed fields and the derived orbit. */
export type PreparedSet = ElementSet & OrbitSummary;

/** The element_sets columns an import writes after spacecraft_id and file_id, in COPY order, with their types. */
export const ELEMENT_SET_COPY_COLUMNS = [
  ['source_line', 'int4'],
  ['catalog_number_int', 'int4'],
  ['epoch', 'timestamptz'],
  ['epoch_ms', 'float8'],
  ['element_set_no', 'int4'],
  ['classification', 'text'],
  ['international_designator', 'text'],
  ['mean_motion_rev_per_day', 'float8'],
  ['mean_motion_dot_rev_per_day2', 'float8'],
  ['mean_motion_ddot_rev_per_day3', 'float8'],
  ['bstar', 'float8'],
  ['inclination_deg', 'float8'],
  ['raan_deg', 'float8'],
  ['eccentricity', 'float8'],
  ['arg_perigee_deg', 'float8'],
  ['mean_anomaly_deg', 'float8'],
  ['rev_at_epoch', 'int4'],
  ['line1', 'text'],
  ['line2', 'text'],
  ['semi_major_axis_km', 'float8'],
  ['apogee_altitude_km', 'float8'],
  ['perigee_altitude_km', 'float8'],
  ['mean_altitude_km', 'float8'],
  ['period_min', 'float8'],
  ['specific_energy_j_per_kg', 'float8'],
] as const;

/** PostgreSQL's binary COPY header: signature, flags (none), header-extension length (0). */
const HEADER = Buffer.from([0x50, 0x47, 0x43, 0x4f, 0x50, 0x59, 0x0a, 0xff, 0x0d, 0x0a, 0x00, 0, 0, 0, 0, 0, 0, 0, 0]);
/** Microseconds between the Unix epoch and PostgreSQL's (2000-01-01T00:00:00Z), in ms. */
const PG_EPOCH_MS = 946_684_800_000;
const TWO_32 = 4_294_967_296;
/** A chunk is handed to the COPY stream once it holds this many bytes (rows never straddle chunks). */
const CHUNK_BYTES = 256 * 1024;

function uuidBytes(id: string): Buffer {
  const hex = id.replace(/-/g, '');
  if (!/^[0-9a-f]{32}$/i.test(hex)) throw new Error(`not a uuid: ${id}`);
  return Buffer.from(hex, 'hex');
}

/**
 * Prepared element sets as PostgreSQL binary COPY data (`copy … from stdin with (format binary)`), in chunks of about
 * 256 KB; `onRows` is told every `progressEvery` rows (and at the end) how many rows have been handed over.
 *
 * The same values the text form would give, without printing and re-reading them: doubles go in as their IEEE bits
 * (exact, as String(n) round-trips), the epoch as the microseconds of its ISO text (what PostgreSQL reads from it),
 * integers as int4 — refused, as the text form's COPY would refuse them, unless they are whole and in range. With
 * `ids` the two leading uuid columns (spacecraft_id, file_id) are written too.
 */
export function* binaryCopyChunks(
  rows: readonly PreparedSet[],
  opts: { ids?: { spacecraftId: string; fileId: string }; progressEvery?: number; onRows?: (n: number) => unknown } = {},
): Generator<Buffer> {
  const ids = opts.ids ? [uuidBytes(opts.ids.spacecraftId), uuidBytes(opts.ids.fileId)] : [];
  const fields = ELEMENT_SET_COPY_COLUMNS.length + ids.length;
  const every = opts.progressEvery ?? 10_000;
  let buf = Buffer.allocUnsafe(CHUNK_BYTES + 4096);
  let o = 0;
  HEADER.copy(buf, 0);
  o = HEADER.length;
  let row = 0;
  const int4 = (v: number, column: string) => {
    if (!Number.isInteger(v) || v < -2_147_483_648 || v > 2_147_483_647) {
      throw new Error(`row ${row + 1}: ${column} ${v} is not a 32-bit integer`);
    }
    buf.writeInt32BE(4, o);
    buf.writeInt32BE(v, o + 4);
    o += 8;
  };
  const float8 = (v: number) => {
    buf.writeInt32BE(8, o);
    buf.writeDoubleBE(v, o + 4);
    o += 12;
  };
  const text = (s: string) => {
    const n = s.length;
    let ascii = true;
    for (let i = 0; i < n; i++) {
      const c = s.charCodeAt(i);
      if (c > 0x7f) {
        ascii = false;
        break;
      }
      buf[o + 4 + i] = c;
    }
    const bytes = ascii ? n : buf.write(s, o + 4, 'utf8');
    buf.writeInt32BE(bytes, o);
    o += 4 + bytes;
  };
  for (; row < rows.length; row++) {
    const r = rows[row]!;
    // Room for the row: fixed fields plus its texts at up to 3 bytes per UTF-16 unit.
    const need =
      2 +
      20 * ids.length +
      8 * 4 +
      12 * 16 +
      12 +
      16 +
      3 * (r.classification.length + r.internationalDesignator.length + r.line1.length + r.line2.length);
    if (o + need > buf.length) {
      yield buf.subarray(0, o);
      buf = Buffer.allocUnsafe(Math.max(CHUNK_BYTES + 4096, need + 2));
      o = 0;
    }
    buf.writeInt16BE(fields, o);
    o += 2;
    for (const id of ids) {
      buf.writeInt32BE(16, o);
      id.copy(buf, o + 4);
      o += 20;
    }
    int4(r.sourceLine, 'source_line');
    int4(r.catalogNumberInt, 'catalog_number_int');
    // The ISO text is what the set's epoch is stored as (to the millisecond), read as PostgreSQL would read it.
    const epochMs = Date.parse(r.epoch);
    if (!Number.isFinite(epochMs)) throw new Error(`row ${row + 1}: epoch "${r.epoch}" is not a time`);
    const us = (epochMs - PG_EPOCH_MS) * 1000;
    const hi = Math.floor(us / TWO_32);
    buf.writeInt32BE(8, o);
    buf.writeInt32BE(hi, o + 4);
    buf.writeUInt32BE(us - hi * TWO_32, o + 8);
    o += 12;
    float8(r.epochMs);
    int4(r.elementSetNo, 'element_set_no');
    text(r.classification);
    text(r.internationalDesignator);
    float8(r.meanMotionRevPerDay);
    float8(r.meanMotionDotRevPerDay2);
    float8(r.meanMotionDdotRevPerDay3);
    float8(r.bstar);
    float8(r.inclinationDeg);
    float8(r.raanDeg);
    float8(r.eccentricity);
    float8(r.argPerigeeDeg);
    float8(r.meanAnomalyDeg);
    int4(r.revAtEpoch, 'rev_at_epoch');
    text(r.line1);
    text(r.line2);
    float8(r.semiMajorAxisKm);
    float8(r.apogeeAltitudeKm);
    float8(r.perigeeAltitudeKm);
    float8(r.meanAltitudeKm);
    float8(r.periodMin);
    float8(r.specificEnergyJPerKg);
    // A chunk ends when full, and at every `progressEvery` rows, so progress counts rows handed over.
    const step = (row + 1) % every === 0;
    if (o >= CHUNK_BYTES || step) {
      yield buf.subarray(0, o);
      if (step) opts.onRows?.(row + 1);
      buf = o >= CHUNK_BYTES ? Buffer.allocUnsafe(CHUNK_BYTES + 4096) : buf.subarray(o);
      o = 0;
    }
  }
  // Trailer: a field count of −1.
  if (o + 2 > buf.length) {
    yield buf.subarray(0, o);
    buf = Buffer.allocUnsafe(2);
    o = 0;
  }
  buf.writeInt16BE(-1, o);
  o += 2;
  yield buf.subarray(0, o);
  if (rows.length % every !== 0) opts.onRows?.(rows.length);
}
