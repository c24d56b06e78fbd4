import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createHash } from 'node:crypto';
import { DEMO_PASSWORD } from '../../server/demo/accounts';
import { agentFor, signIn, type Agent, type TestApp } from '../setup/test-app';
import { countRows, importUpload, orbitDesk, settle, signedInAs, tern1Set, tleLines, upload, uploadAndPreview } from './orbit-helpers';

let t: TestApp;
let engineer: Agent;
let craftId: string;

beforeAll(async () => {
  ({ t, engineer, spacecraftId: craftId } = await orbitDesk());
});
afterAll(async () => t.close());

const badChecksum = (line: string) => line.slice(0, 68) + String((Number(line[68]) + 1) % 10);

describe('uploading element-set files', () => {
  it('previews a valid file without storing anything, then imports every set and links it to the kept file', async () => {
    const text =
      ['TERN-1', ...tleLines([tern1Set(0, 1)]), 'TERN-1', ...tleLines([tern1Set(0.4, 2)]), ...tleLines([tern1Set(0.8, 3)])].join('\n') +
      '\n';
    const preview = await uploadAndPreview(engineer, craftId, text, 'valid.tle');
    expect(preview.status).toBe('previewed');
    expect(preview.counts).toEqual({ records: 3, new: 3, duplicate: 0, invalid: 0 });
    expect(preview.errors).toEqual([]);
    expect(await countRows(t, 'element_sets')).toBe(0);
    expect(await countRows(t, 'element_set_files')).toBe(0);

    const done = await importUpload(engineer, preview.id);
    expect(done.status).toBe('imported');
    expect(done.importedCount).toBe(3);
    const { rows: files } = await t.database.pool.query('select * from element_set_files');
    expect(files).toHaveLength(1);
    expect(files[0].content).toBe(text);
    expect(files[0].content_sha256).toBe(createHash('sha256').update(text).digest('hex'));
    expect(files[0].filename).toBe('valid.tle');
    const { rows: who } = await t.database.pool.query("select id from accounts where email = 'engineer@saltmarsh.example'");
    expect(files[0].uploaded_by).toBe(who[0].id);
    const { rows: sets } = await t.database.pool.query(
      'select file_id, element_set_no, source_line from element_sets order by element_set_no',
    );
    expect(sets.map((s) => s.element_set_no)).toEqual([1, 2, 3]);
    expect(sets.every((s) => s.file_id === files[0].id)).toBe(true);
    expect(sets.map((s) => s.source_line)).toEqual([1, 4, 7]);
  });

  it('lists the errors of a mixed file with their line numbers, then imports only the good sets', async () => {
    const good1 = tleLines([tern1Set(2, 10)]);
    const bad = tleLines([tern1Set(2.3, 11)]);
    const good2 = tleLines([tern1Set(2.6, 12)]);
    const lines = [...good1, bad[0]!, badChecksum(bad[1]!), '2 99871  98.5 broken', ...good2];
    const before = await countRows(t, 'element_sets');
    const preview = await uploadAndPreview(engineer, craftId, lines.join('\n'), 'mixed.tle');
    expect(preview.status).toBe('previewed');
    expect(preview.counts.new).toBe(2);
    expect(preview.counts.invalid).toBeGreaterThanOrEqual(2);
    const errorLines = preview.errors.map((e) => e.line);
    expect(errorLines).toContain(4); // the bad checksum is on line 4
    expect(errorLines).toContain(5); // the stray line 2
    expect(preview.errors.find((e) => e.line === 4)!.message).toMatch(/checksum/i);
    expect(await countRows(t, 'element_sets')).toBe(before);
    const done = await importUpload(engineer, preview.id);
    expect(done.importedCount).toBe(2);
    const { rows } = await t.database.pool.query(
      'select element_set_no from element_sets where element_set_no between 10 and 12 order by 1',
    );
    expect(rows.map((r) => r.element_set_no)).toEqual([10, 12]);
  });

  it('stores nothing from a file whose every record is invalid', async () => {
    const lines = tleLines([tern1Set(3, 20), tern1Set(3.3, 21)]).map((l, i) => (i % 2 ? badChecksum(l) : l));
    const sets = await countRows(t, 'element_sets');
    const files = await countRows(t, 'element_set_files');
    const preview = await uploadAndPreview(engineer, craftId, lines.join('\n'), 'all-bad.tle');
    expect(preview.counts).toMatchObject({ new: 0, duplicate: 0, invalid: 2 });
    expect(preview.message).toMatch(/no valid element sets/i);
    const done = await importUpload(engineer, preview.id);
    expect(done.importedCount).toBe(0);
    expect(await countRows(t, 'element_sets')).toBe(sets);
    expect(await countRows(t, 'element_set_files')).toBe(files);
  });

  it('imports nothing from the same file uploaded again, and says so', async () => {
    const text = tleLines([tern1Set(4, 30), tern1Set(4.5, 31)]).join('\n') + '\n';
    const first = await importUpload(engineer, (await uploadAndPreview(engineer, craftId, text, 'again.tle')).id);
    expect(first.importedCount).toBe(2);
    const sets = await countRows(t, 'element_sets');
    const files = await countRows(t, 'element_set_files');
    const again = await uploadAndPreview(engineer, craftId, text, 'again-renamed.tle');
    expect(again.counts).toMatchObject({ new: 0, duplicate: 2 });
    expect(again.existingFile?.id).toBe(first.fileId);
    expect(again.message).toMatch(/nothing new/i);
    const done = await importUpload(engineer, again.id);
    expect(done.importedCount).toBe(0);
    expect(done.message).toMatch(/nothing imported.*already stored/i);
    expect(await countRows(t, 'element_sets')).toBe(sets);
    expect(await countRows(t, 'element_set_files')).toBe(files);
  });

  it('counts sets already stored as duplicates when a different file repeats some of them', async () => {
    const text = tleLines([tern1Set(4, 30), tern1Set(5, 32)]).join('\n');
    const preview = await uploadAndPreview(engineer, craftId, text, 'overlap.tle');
    expect(preview.counts).toMatchObject({ new: 1, duplicate: 1, invalid: 0 });
    const done = await importUpload(engineer, preview.id);
    expect(done.importedCount).toBe(1);
  });

  it('accepts a few pasted lines in the text field', async () => {
    const res = await engineer
      .post(`/api/orbit/spacecraft/${craftId}/uploads`)
      .set('x-csrf-token', engineer.csrf)
      .field('text', tleLines([tern1Set(6, 40)]).join('\n'));
    expect(res.status, JSON.stringify(res.body)).toBe(202);
    const job = await settle(engineer, res.body.upload.id);
    expect(job.counts.new).toBe(1);
    const cancelled = await engineer.post(`/api/orbit/uploads/${job.id}/cancel`).set('x-csrf-token', engineer.csrf).send({});
    expect(cancelled.status).toBe(200);
    expect(cancelled.body.upload.status).toBe('cancelled');
    const importAfterCancel = await engineer.post(`/api/orbit/uploads/${job.id}/import`).set('x-csrf-token', engineer.csrf).send({});
    expect(importAfterCancel.status).toBe(409);
    expect(importAfterCancel.body.error.code).toBe('orbit.upload_not_ready');
  });

  it('refuses a binary file and a text file that is no element-set format, storing nothing', async () => {
    const jobs = await countRows(t, 'orbit_ingest_jobs');
    const png = Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 13, 0x49, 0x48, 0x44, 0x52]);
    const bin = await upload(engineer, craftId, png, 'sets.tle');
    expect(bin.status).toBe(415);
    expect(bin.body.error.code).toBe('orbit.not_text');
    expect(bin.body.error.message).toMatch(/not text/);
    const prose = await upload(engineer, craftId, 'Dear team,\nhere are the notes from Tuesday.\n', 'notes.txt');
    expect(prose.status).toBe(415);
    expect(prose.body.error.code).toBe('orbit.unrecognised_format');
    expect(prose.body.error.message).toContain('Dear team');
    const empty = await upload(engineer, craftId, '', 'empty.tle');
    expect(empty.status).toBe(400);
    expect(await countRows(t, 'orbit_ingest_jobs')).toBe(jobs);
  });

  it('answers bad ids and unknown uploads with 400 and 404, never 500', async () => {
    expect((await engineer.get('/api/orbit/uploads/not-an-id')).status).toBe(400);
    expect((await engineer.get('/api/orbit/uploads/00000000-0000-4000-8000-000000000000')).status).toBe(404);
    const noCraft = await upload(engineer, '00000000-0000-4000-8000-000000000000', tleLines([tern1Set(7, 50)]).join('\n'));
    expect(noCraft.status).toBe(404);
  });

  it('rejects sets of another object with a line-numbered error', async () => {
    const other = tleLines([tern1Set(8, 60, { catalogNumber: '12345', catalogNumberInt: 12345 })]);
    const preview = await uploadAndPreview(engineer, craftId, [...tleLines([tern1Set(8, 61)]), ...other].join('\n'));
    expect(preview.counts).toMatchObject({ new: 1, invalid: 1 });
    expect(preview.errors[0]).toMatchObject({ line: 3, field: 'catalog number' });
    expect(preview.errors[0]!.message).toContain('12345');
  });

  it('never inserts a set twice when two uploads of one file are imported at the same time', async () => {
    const sets = Array.from({ length: 400 }, (_, i) => tern1Set(20 + i * 0.3, 100 + (i % 800)));
    const text = tleLines(sets).join('\n') + '\n';
    const other = agentFor(t.app);
    await signIn(other, 'admin@saltmarsh.example', DEMO_PASSWORD);
    const before = await countRows(t, 'element_sets');
    const [a, b] = await Promise.all([
      uploadAndPreview(engineer, craftId, text, 'same.tle'),
      uploadAndPreview(other, craftId, text, 'same.tle'),
    ]);
    expect(a.counts.new).toBe(400);
    expect(b.counts.new).toBe(400);
    const [ia, ib] = await Promise.all([importUpload(engineer, a.id), importUpload(other, b.id)]);
    expect(ia.status).toBe('imported');
    expect(ib.status).toBe('imported');
    expect(ia.importedCount! + ib.importedCount!).toBe(400);
    expect(await countRows(t, 'element_sets')).toBe(before + 400);
    const { rows } = await t.database.pool.query('select count(*)::int as n from element_set_files where content_sha256 = $1', [
      createHash('sha256').update(text).digest('hex'),
    ]);
    expect(rows[0].n).toBe(1);
  });

  it('refuses the same import twice', async () => {
    const preview = await uploadAndPreview(engineer, craftId, tleLines([tern1Set(9, 70)]).join('\n'));
    const [r1, r2] = await Promise.all([
      engineer.post(`/api/orbit/uploads/${preview.id}/import`).set('x-csrf-token', engineer.csrf).send({}),
      engineer.post(`/api/orbit/uploads/${preview.id}/import`).set('x-csrf-token', engineer.csrf).send({}),
    ]);
    expect([r1.status, r2.status].sort()).toEqual([202, 409]);
    expect((await settle(engineer, preview.id)).importedCount).toBe(1);
  });

  it('lets outreach and backers upload nothing', async () => {
    const outreach = await signedInAs(t, 'outreach');
    const res = await upload(outreach, craftId, tleLines([tern1Set(10, 80)]).join('\n'));
    expect(res.status).toBe(403);
  });
});

describe('the upload size limit', () => {
  let small: TestApp;
  let eng: Agent;
  let id: string;
  beforeAll(async () => {
    ({ t: small, engineer: eng, spacecraftId: id } = await orbitDesk({ UPLOAD_LIMIT_BYTES: '4096' }));
  });
  afterAll(async () => small.close());

  it('answers an oversized file with 413 naming the limit, and stores nothing', async () => {
    const text = tleLines(Array.from({ length: 40 }, (_, i) => tern1Set(i, i + 1))).join('\n');
    expect(Buffer.byteLength(text)).toBeGreaterThan(4096);
    const res = await upload(eng, id, text, 'big.tle');
    expect(res.status).toBe(413);
    expect(res.body.error.code).toBe('orbit.file_too_large');
    expect(res.body.error.message).toContain('4 KB');
    expect(await countRows(small, 'orbit_ingest_jobs')).toBe(0);
    const fits = await upload(eng, id, tleLines([tern1Set(0, 1)]).join('\n'), 'small.tle');
    expect(fits.status).toBe(202);
  });
});
