import { mkdtempSync, rmSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import pino from 'pino';
import { loadConfig } from '../../server/config';
import { createJobs, type QueueDefinition } from '../../server/jobs';
import { housekeepingQueue } from '../../server/jobs/housekeeping';
import { createLocalDiskStorage, type FileStorage } from '../../server/lib/storage';
import { createTestDatabase, type TestDatabase } from '../setup/test-db';

// The hourly housekeeping job lets go of uploads nobody finished: held element-set text, and dispatch images
// that no dispatch or published version uses. Run here through the queue's own handler, as the schedule runs it.

let database: TestDatabase;
let dir: string;
let storage: FileStorage;

beforeAll(async () => {
  database = await createTestDatabase();
  dir = mkdtempSync(path.join(os.tmpdir(), 'lightkeel-housekeeping-'));
  storage = createLocalDiskStorage(dir);
});
afterAll(async () => {
  await database.drop();
  rmSync(dir, { recursive: true, force: true });
});

async function runHousekeepingJob() {
  const config = loadConfig({
    NODE_ENV: 'test',
    LOG_LEVEL: 'silent',
    DATABASE_URL: database.url,
    UPLOADS_DIR: dir,
    UPLOAD_HOLD_HOURS: '48',
    ORPHAN_FILE_HOURS: '24',
  });
  const jobs = createJobs({
    pool: database.pool,
    db: database.db,
    config,
    logger: pino({ level: 'silent' }),
    queues: [housekeepingQueue as QueueDefinition],
    deps: { storage },
  });
  await jobs.start();
  try {
    await jobs.send('housekeeping', { tasks: ['uploads'] });
    expect(await jobs.runPending('housekeeping')).toBe(1);
  } finally {
    await jobs.stop();
  }
}

async function storeImage(key: string, purpose: string, hoursAgo: number) {
  await storage.put(key, Buffer.from(`bytes of ${key}`));
  await database.pool.query(
    `insert into stored_files (key, content_type, byte_size, purpose, created_at) values ($1, 'image/png', 10, $2, now() - make_interval(hours => $3::int))`,
    [key, purpose, hoursAgo],
  );
}

describe('housekeeping of orphaned uploads', () => {
  it('releases held element-set text after the hold, and removes unused dispatch images after their age, keeping the rest', async () => {
    const p = database.pool;
    const { rows: craft } = await p.query<{ id: string }>(
      `insert into spacecraft (slug, name, catalog_number, catalog_number_int, mass_kg, sail_area_m2, sail_reflectivity, drag_coefficient, drag_area_edge_on_m2)
       values ('tern-1', 'Tern-1', '99871', 99871, 4.8, 24, 0.9, 2.2, 0.12) returning id`,
    );
    const upload = async (status: string, hoursAgo: number) => {
      const { rows } = await p.query<{ id: string }>(
        `insert into orbit_ingest_jobs (spacecraft_id, status, filename, byte_size, content_sha256, content, updated_at)
         values ($1, $2, 'sets.tle', 5, 'sha', 'held', now() - make_interval(hours => $3::int)) returning id`,
        [craft[0]!.id, status, hoursAgo],
      );
      return rows[0]!.id;
    };
    const abandoned = await upload('previewed', 49);
    const recent = await upload('previewed', 47);
    const imported = await upload('imported', 1);
    const waiting = await upload('parsing', 100);

    await storeImage('heroes/replaced.png', 'dispatch-hero', 25);
    await storeImage('heroes/in-use.png', 'dispatch-hero', 200);
    await storeImage('heroes/just-uploaded.png', 'dispatch-hero', 1);
    await storeImage('charts/edited-away.png', 'dispatch-chart', 30);
    await storeImage('charts/in-a-version.png', 'dispatch-chart', 300);
    await storeImage('charts/on-the-draft.png', 'dispatch-chart', 300);
    const chart = (imageKey: string) => JSON.stringify([{ snapshotId: 'x', title: 't', caption: 'c', alt: 'a', imageKey }]);
    const { rows: d } = await p.query<{ id: string }>(
      `insert into dispatches (slug, title, hero_image_key, charts) values ('a-dispatch', 'A dispatch', 'heroes/in-use.png', $1) returning id`,
      [chart('charts/on-the-draft.png')],
    );
    await p.query(
      `insert into dispatch_versions (dispatch_id, version, title, body_markdown, charts) values ($1, 1, 'A dispatch', '', $2)`,
      [d[0]!.id, chart('charts/in-a-version.png')],
    );

    await runHousekeepingJob();

    const { rows: jobs } = await p.query<{ id: string; status: string; content: string | null; message: string | null }>(
      'select id, status, content, message from orbit_ingest_jobs',
    );
    const byId = new Map(jobs.map((j) => [j.id, j]));
    expect(byId.get(abandoned)).toMatchObject({
      status: 'cancelled',
      content: null,
      message: 'Not imported within 48 hours, so the held file was released. Upload it again to import it.',
    });
    expect(byId.get(recent)).toMatchObject({ status: 'previewed', content: 'held' });
    expect(byId.get(imported)).toMatchObject({ status: 'imported', content: null });
    // Waiting for its worker (the job system retries or fails it): housekeeping leaves it alone.
    expect(byId.get(waiting)).toMatchObject({ status: 'parsing', content: 'held' });

    const { rows: files } = await p.query<{ key: string }>('select key from stored_files order by key');
    expect(files.map((f) => f.key)).toEqual([
      'charts/in-a-version.png',
      'charts/on-the-draft.png',
      'heroes/in-use.png',
      'heroes/just-uploaded.png',
    ]);
    expect(await storage.get('heroes/replaced.png')).toBeNull();
    expect(await storage.get('charts/edited-away.png')).toBeNull();
    for (const f of files) expect((await storage.get(f.key))?.toString()).toBe(`bytes of ${f.key}`);
  });
});
