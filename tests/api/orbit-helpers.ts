import { expect } from 'vitest';
import pino from 'pino';
import { createDb } from '../../server/db/client';
import { createJobs, type QueueDefinition } from '../../server/jobs';
import { elementSetIngestFailedQueue, elementSetIngestQueue } from '../../server/jobs/element-set-ingest';
import { createTestApp, agentFor, signIn, type Agent, type TestApp } from '../setup/test-app';
import { seedDemoAccounts, DEMO_PASSWORD } from '../../server/demo/accounts';
import { TERN1 } from '../../shared/orbit/simulate';
import { writeTle } from '../../shared/orbit/tle-write';
import type { TleWriteInput } from '../../shared/orbit/tle-write';

export const tern1Record = {
  name: 'Tern-1',
  slug: 'tern-1',
  catalogNumber: TERN1.catalogNumber,
  internationalDesignator: TERN1.internationalDesignator,
  massKg: 4.8,
  sailAreaM2: 24,
  sailReflectivity: 0.9,
  dragCoefficient: 2.2,
  dragAreaEdgeOnM2: 0.12,
  launchDate: '2025-10-08',
  sailDeployedAt: '2025-11-01T00:00:00Z',
};

export const ingestQueues = [elementSetIngestQueue as QueueDefinition, elementSetIngestFailedQueue as QueueDefinition];

/** A worker "process" for the element-set queues on the test database: its own pool and pg-boss. */
export async function startIngestWorker(t: TestApp, deps: Record<string, unknown> = {}) {
  const { db, pool } = createDb(t.database.url, { max: 4 });
  const jobs = createJobs({
    pool,
    db,
    config: t.config,
    logger: pino({ level: 'silent' }),
    queues: ingestQueues,
    worker: true,
    mailSender: false,
    deps,
  });
  await jobs.start();
  await jobs.work();
  return {
    jobs,
    pool,
    stop: async () => {
      await jobs.stop();
      await pool.end();
    },
  };
}

/** The orbit desk with an engineer signed in, Tern-1 on file and one worker for uploads (stopped by t.close). */
export async function orbitDesk(env: Record<string, string> = {}, opts: { worker?: boolean } = {}) {
  const t: TestApp = await createTestApp({ SIGN_IN_LIMIT_PER_IP: '1000', ...env });
  if (opts.worker !== false) {
    const worker = await startIngestWorker(t);
    const close = t.close;
    t.close = async () => {
      await worker.stop();
      await close();
    };
  }
  await seedDemoAccounts(t.database.db);
  const engineer = agentFor(t.app);
  await signIn(engineer, 'engineer@saltmarsh.example', DEMO_PASSWORD);
  const res = await engineer.post('/api/orbit/spacecraft').set('x-csrf-token', engineer.csrf).send(tern1Record);
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  return { t, engineer, spacecraftId: res.body.spacecraft.id as string };
}

export async function signedInAs(t: TestApp, role: string): Promise<Agent> {
  const a = agentFor(t.app);
  await signIn(a, `${role}@saltmarsh.example`, DEMO_PASSWORD);
  return a;
}

export function upload(agent: Agent, spacecraftId: string, content: string | Buffer, filename = 'sets.tle') {
  return agent
    .post(`/api/orbit/spacecraft/${spacecraftId}/uploads`)
    .set('x-csrf-token', agent.csrf)
    .attach('file', typeof content === 'string' ? Buffer.from(content, 'utf8') : content, filename);
}

export type UploadBody = {
  id: string;
  status: string;
  counts: { records: number; new: number; duplicate: number; invalid: number };
  importedCount: number | null;
  errors: { line: number; message: string; field?: string }[];
  message: string | null;
  existingFile: { id: string } | null;
  fileId: string | null;
  progress: { processed: number; total: number };
};

/** Polls the job like the browser does, until it leaves `parsing`/`importing` (bounded). */
export async function settle(agent: Agent, jobId: string): Promise<UploadBody> {
  for (let i = 0; i < 600; i++) {
    const res = await agent.get(`/api/orbit/uploads/${jobId}`).expect(200);
    const job = res.body.upload as UploadBody;
    if (job.status !== 'parsing' && job.status !== 'importing') return job;
    await new Promise((r) => setTimeout(r, 25));
  }
  throw new Error(`upload ${jobId} did not settle`);
}

export async function uploadAndPreview(agent: Agent, spacecraftId: string, content: string | Buffer, filename?: string) {
  const res = await upload(agent, spacecraftId, content, filename);
  expect(res.status, JSON.stringify(res.body)).toBe(202);
  return settle(agent, res.body.upload.id);
}

export async function importUpload(agent: Agent, jobId: string) {
  const res = await agent.post(`/api/orbit/uploads/${jobId}/import`).set('x-csrf-token', agent.csrf).send({});
  expect(res.status, JSON.stringify(res.body)).toBe(202);
  return settle(agent, jobId);
}

/** A Tern-1 set at `day` days after 1 Jan 2026, element-set number `no`. */
export function tern1Set(day: number, no: number, over: Partial<TleWriteInput> = {}): TleWriteInput {
  return {
    catalogNumber: TERN1.catalogNumber,
    catalogNumberInt: TERN1.catalogNumberInt,
    classification: 'U',
    internationalDesignator: TERN1.internationalDesignator,
    epochMs: Date.UTC(2026, 0, 1) + day * 86_400_000,
    meanMotionRevPerDay: 14.3266 - day * 1e-5,
    meanMotionDotRevPerDay2: 2.5e-6,
    meanMotionDdotRevPerDay3: 0,
    bstar: 2.1e-3,
    inclinationDeg: 98.52,
    raanDeg: (40 + day) % 360,
    eccentricity: 0.0002,
    argPerigeeDeg: 90,
    meanAnomalyDeg: 270,
    elementSetNo: no,
    revAtEpoch: 12000 + Math.round(day * 14.3),
    ...over,
  };
}

export function tleLines(sets: TleWriteInput[]): string[] {
  const out: string[] = [];
  for (const s of sets) {
    const { line1, line2 } = writeTle(s);
    out.push(line1, line2);
  }
  return out;
}

export async function countRows(t: TestApp, table: string): Promise<number> {
  const { rows } = await t.database.pool.query(`select count(*)::int as n from ${table}`);
  return rows[0].n as number;
}
