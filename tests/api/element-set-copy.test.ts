import { pipeline } from 'node:stream/promises';
import { Readable } from 'node:stream';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { from as copyFrom } from 'pg-copy-streams';
import { binaryCopyChunks, ELEMENT_SET_COPY_COLUMNS, type PreparedSet } from '../../server/modules/orbit/element-set-copy';
import { prepareSets } from '../../server/modules/orbit/ingest.service';
import { createTestDatabase, type TestDatabase } from '../setup/test-db';
import { tern1Set, tleLines } from './orbit-helpers';
import { TERN1 } from '../../shared/orbit/simulate';

// Imports hand element sets to PostgreSQL as binary COPY data. Checked here against PostgreSQL itself: the same sets
// written as COPY text (the documented text format: tab-separated, `\N`-free, doubles printed by String(n), which
// round-trips) and as binary must read back identical, column by column.

let database: TestDatabase;
const names = ELEMENT_SET_COPY_COLUMNS.map(([n]) => n).join(', ');
const table = `create temp table sets_text (${ELEMENT_SET_COPY_COLUMNS.map(([n, t]) => `${n} ${t}`).join(', ')});
  create temp table sets_binary (like sets_text); create temp table sets_ids (spacecraft_id uuid, file_id uuid, like sets_text)`;

beforeAll(async () => {
  database = await createTestDatabase();
}, 120_000);
afterAll(async () => {
  await database.drop();
});

function textRow(r: PreparedSet) {
  return [
    r.sourceLine,
    r.catalogNumberInt,
    r.epoch,
    r.epochMs,
    r.elementSetNo,
    r.classification,
    r.internationalDesignator,
    r.meanMotionRevPerDay,
    r.meanMotionDotRevPerDay2,
    r.meanMotionDdotRevPerDay3,
    r.bstar,
    r.inclinationDeg,
    r.raanDeg,
    r.eccentricity,
    r.argPerigeeDeg,
    r.meanAnomalyDeg,
    r.revAtEpoch,
    r.line1,
    r.line2,
    r.semiMajorAxisKm,
    r.apogeeAltitudeKm,
    r.perigeeAltitudeKm,
    r.meanAltitudeKm,
    r.periodMin,
    r.specificEnergyJPerKg,
  ].join('\t');
}

describe('binary COPY of element sets', () => {
  it('stores exactly what the text form stores, reports progress per step of rows and writes the two ids', async () => {
    // 2,500 sets of the demo craft over four years (a leap day among them), at odd fractions of a day, with signed
    // exponents in the drag terms.
    const N = 2_500;
    const list = Array.from({ length: N }, (_, k) =>
      tern1Set(k * 0.5837, (k % 999) + 1, {
        meanMotionDotRevPerDay2: (k % 2 ? -1 : 1) * 1.234e-5 * (1 + (k % 7)),
        meanMotionDdotRevPerDay3: k % 3 ? 0 : 4.5e-9,
        bstar: (k % 5 ? 1 : -1) * 3.21e-4 * (1 + (k % 11)),
        eccentricity: 0.0001 + 1e-6 * (k % 97),
      }),
    );
    const text = tleLines(list).join('\n') + '\n';
    const { prepared, errors } = prepareSets(text, { ...TERN1, name: 'Tern-1' });
    expect(errors).toEqual([]);
    expect(prepared).toHaveLength(N);
    // A designator outside ASCII (OMM allows free text there) goes in as UTF-8.
    prepared[7] = { ...prepared[7]!, internationalDesignator: 'Ø-prüf ✓' };
    const client = await database.pool.connect();
    try {
      await client.query(table);
      await pipeline(
        Readable.from([prepared.map(textRow).join('\n') + '\n']),
        client.query(copyFrom(`copy sets_text (${names}) from stdin`)),
      );
      const steps: number[] = [];
      await pipeline(
        Readable.from(binaryCopyChunks(prepared, { progressEvery: 1000, onRows: (n) => steps.push(n) })),
        client.query(copyFrom(`copy sets_binary (${names}) from stdin with (format binary)`)),
      );
      expect(steps).toEqual([1000, 2000, 2500]);
      const ids = { spacecraftId: '0b8f5a52-3d4c-4e1f-9a7b-2c6d8e0f1a23', fileId: 'f1e2d3c4-b5a6-4978-8695-a4b3c2d1e0f9' };
      await pipeline(
        Readable.from(binaryCopyChunks(prepared, { ids })),
        client.query(copyFrom(`copy sets_ids (spacecraft_id, file_id, ${names}) from stdin with (format binary)`)),
      );
      const { rows: count } = await client.query(
        'select (select count(*) from sets_text)::int as t, (select count(*) from sets_binary)::int as b',
      );
      expect(count[0]).toEqual({ t: N, b: N });
      // Row for row, every column the same value (float8 compared as values: `=` on doubles is exact).
      const { rows: differ } = await client.query(
        `select count(*)::int as n from sets_text t full join sets_binary b on b.source_line = t.source_line
          where (${ELEMENT_SET_COPY_COLUMNS.map(([n]) => `t.${n}`).join(', ')}) is distinct from (${ELEMENT_SET_COPY_COLUMNS.map(([n]) => `b.${n}`).join(', ')})`,
      );
      expect(differ[0].n).toBe(0);
      const { rows: withIds } = await client.query(
        `select count(*)::int as n, count(*) filter (where spacecraft_id = $1 and file_id = $2)::int as ours from sets_ids i
           join sets_text t on t.source_line = i.source_line and (${ELEMENT_SET_COPY_COLUMNS.map(([n]) => `t.${n}`).join(', ')}) is not distinct from (${ELEMENT_SET_COPY_COLUMNS.map(([n]) => `i.${n}`).join(', ')})`,
        [ids.spacecraftId, ids.fileId],
      );
      expect(withIds[0]).toEqual({ n: N, ours: N });
      // Spot values read back as PostgreSQL prints them.
      const { rows: spot } = await client.query(
        `select to_char(epoch at time zone 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS.US') as epoch, international_designator, line1 from sets_binary where source_line = $1`,
        [prepared[7]!.sourceLine],
      );
      expect(spot[0]).toEqual({
        epoch: prepared[7]!.epoch.replace('Z', '000'),
        international_designator: 'Ø-prüf ✓',
        line1: prepared[7]!.line1,
      });
    } finally {
      client.release();
    }
  });

  it('refuses a whole number field that is not a 32-bit integer, as the text form would', () => {
    const text = tleLines([tern1Set(3, 1)]).join('\n') + '\n';
    const { prepared } = prepareSets(text, { ...TERN1, name: 'Tern-1' });
    const bad = [{ ...prepared[0]!, revAtEpoch: 1.5 }];
    expect(() => [...binaryCopyChunks(bad)]).toThrow('rev_at_epoch 1.5 is not a 32-bit integer');
    const big = [{ ...prepared[0]!, elementSetNo: 2 ** 31 }];
    expect(() => [...binaryCopyChunks(big)]).toThrow('element_set_no 2147483648 is not a 32-bit integer');
  });
});

describe('sets repeated within one file', () => {
  it('keeps the first of each epoch + element-set number, and keeps sets that share only the epoch or only the number', () => {
    const a = tern1Set(10, 5),
      sameEpochOtherNo = tern1Set(10, 6),
      sameNoOtherEpoch = tern1Set(10.5, 5),
      thirdAtEpoch = tern1Set(10, 7);
    const text = tleLines([a, a, sameEpochOtherNo, sameNoOtherEpoch, sameEpochOtherNo, thirdAtEpoch, thirdAtEpoch, a]).join('\n') + '\n';
    const r = prepareSets(text, { ...TERN1, name: 'Tern-1' });
    expect(r.errors).toEqual([]);
    expect(r.inFileDuplicates).toBe(4);
    // Kept in file order: lines 1, 5, 7 and 11 (each set is two lines).
    expect(r.prepared.map((s) => [s.sourceLine, s.elementSetNo])).toEqual([
      [1, 5],
      [5, 6],
      [7, 5],
      [11, 7],
    ]);
    expect(r.recordCount).toBe(8);
  });
});
