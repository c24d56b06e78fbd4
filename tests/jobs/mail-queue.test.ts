import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import pino from 'pino';
import { Resend } from 'resend';
import { sql } from 'drizzle-orm';
import { loadConfig, type Config } from '../../server/config';
import { createMailSender, mailSenderOptionsFrom, backoffSeconds } from '../../server/jobs/mail-sender';
import { queueMail, MailQueueDataError } from '../../server/modules/mail/mail-queue';
import { mailBatches, mailQueue, mailShared } from '../../server/modules/mail/mail.tables';
import { runHousekeeping } from '../../server/jobs/housekeeping';
import { createMailFake, type MailFake } from '../../fakes/mail/server';
import { createTestDatabase, type TestDatabase } from '../setup/test-db';

const logger = pino({ level: 'silent' });
let database: TestDatabase;
let fake: MailFake;
let config: Config;

const verifyData = (n: number) => ({ displayName: `Backer ${n}`, verifyUrl: `https://lightkeel.example/verify-email?token=t${n}` });

async function enqueue(n: number, extra: { batchKey?: string } = {}) {
  await database.db.transaction(async (tx) => {
    await queueMail(tx, {
      template: 'verify-email',
      to: `backer${n}@example.org`,
      data: verifyData(n),
      category: 'transactional',
      idempotencyKey: `test/${n}`,
      ...extra,
    });
  });
}

const rows = () => database.db.select().from(mailQueue).orderBy(mailQueue.idempotencyKey);
const sender = (over: Partial<Config> = {}, resend?: Resend) =>
  createMailSender(database.pool, mailSenderOptionsFrom({ config: { ...config, ...over }, deps: resend ? { resend } : {} }), logger);
const delivered = (to: string) => fake.messages().filter((m) => m.to.includes(to));

beforeAll(async () => {
  database = await createTestDatabase();
  fake = await createMailFake({ port: 0, apiKey: 're_queue_test' });
  config = loadConfig({
    NODE_ENV: 'test',
    DATABASE_URL: database.url,
    RESEND_API_KEY: 're_queue_test',
    RESEND_BASE_URL: fake.url,
    MAIL_LEASE_SECONDS: '5',
  });
});
afterAll(async () => {
  await fake.close();
  await database.drop();
});
beforeEach(async () => {
  fake.clear();
  fake.faults.set({ rateLimitNext: 0, failNext: 0, delayMs: 0, retryAfterSeconds: 1 });
  await database.db.delete(mailQueue);
  await database.db.delete(mailShared);
  await database.db.delete(mailBatches);
});

describe('the mail queue (outbox)', () => {
  it('writes the message with the transaction that causes it, and not at all when that transaction rolls back', async () => {
    await expect(
      database.db.transaction(async (tx) => {
        await queueMail(tx, {
          template: 'verify-email',
          to: 'a@example.org',
          data: verifyData(1),
          category: 'transactional',
          idempotencyKey: 'rb/1',
        });
        throw new Error('the causing change failed');
      }),
    ).rejects.toThrow('the causing change failed');
    expect(await rows()).toHaveLength(0);
    await enqueue(1);
    await enqueue(1); // same key: one row
    expect((await rows()).map((r) => [r.idempotencyKey, r.state])).toEqual([['test/1', 'queued']]);
  });

  it('refuses data the template would refuse, before anything is written', async () => {
    await expect(
      queueMail(database.db, {
        template: 'verify-email',
        to: 'a@example.org',
        data: { displayName: 'x', verifyUrl: 'javascript:alert(1)' },
        category: 'transactional',
        idempotencyKey: 'bad/1',
      }),
    ).rejects.toBeInstanceOf(MailQueueDataError);
    expect(await rows()).toHaveLength(0);
  });

  it('keeps mail while the service answers 500 or is down, and delivers it once after', async () => {
    await enqueue(1);
    await enqueue(2);
    fake.faults.set({ failNext: 10 });
    await sender().drain();
    let r = await rows();
    expect(r.map((x) => x.state)).toEqual(['queued', 'queued']);
    expect(r[0]!.lastAnswer).toMatchObject({ status: 500, name: 'internal_server_error' });
    expect(r[0]!.attempts).toBe(1);

    // Down: nothing listens at the address.
    await database.db.execute(sql`update mail_queue set next_attempt_at = now()`);
    const down = sender({ RESEND_BASE_URL: 'http://127.0.0.1:9' });
    await down.drain();
    r = await rows();
    expect(r.map((x) => x.state)).toEqual(['queued', 'queued']);
    expect((r[0]!.lastAnswer as { status: number | null }).status).toBeNull();
    expect(r[0]!.attempts).toBe(2);
    expect(fake.messages()).toHaveLength(0);

    // The service is back: a due retry goes out, once each.
    fake.faults.set({ failNext: 0 });
    await database.db.execute(sql`update mail_queue set next_attempt_at = now()`);
    await sender().drain();
    r = await rows();
    expect(r.map((x) => x.state)).toEqual(['sent', 'sent']);
    expect(r[0]!.providerId).toBe(delivered('backer1@example.org')[0]!.id);
    expect(delivered('backer1@example.org')).toHaveLength(1);
    expect(delivered('backer2@example.org')).toHaveLength(1);
  });

  it('honours Retry-After on a 429: the row waits at least that long', async () => {
    fake.faults.set({ rateLimitNext: 1, retryAfterSeconds: 40 });
    await enqueue(3);
    await sender().drain();
    const [row] = await rows();
    expect(row!.state).toBe('queued');
    expect(row!.lastAnswer).toMatchObject({ status: 429, name: 'rate_limit_exceeded', retryAfterSeconds: 40 });
    const waitS = (row!.nextAttemptAt.getTime() - row!.updatedAt.getTime()) / 1000;
    expect(waitS).toBeGreaterThanOrEqual(39.9);
    expect(waitS).toBeLessThan(41);
    // Not due yet: a pass sends nothing.
    await sender().drain();
    expect(fake.messages()).toHaveLength(0);
  });

  it('backs off exponentially from 5 s, capped, with Retry-After as a floor', () => {
    expect([1, 2, 3, 4].map((a) => backoffSeconds(a, undefined, 900))).toEqual([5, 10, 20, 40]);
    expect(backoffSeconds(12, undefined, 900)).toBe(900);
    expect(backoffSeconds(1, 30, 900)).toBe(30);
    expect(backoffSeconds(1, 5000, 900)).toBe(900);
  });

  it('marks a message failed, with the service answer, when the service refuses it for good', async () => {
    await database.db.transaction(async (tx) => {
      await queueMail(tx, {
        template: 'verify-email',
        to: 'not an address',
        data: verifyData(4),
        category: 'transactional',
        idempotencyKey: 'bad-to/4',
      });
    });
    await sender().drain();
    const [row] = await rows();
    expect(row!.state).toBe('failed');
    expect(row!.lastAnswer).toMatchObject({ status: 400, name: 'validation_error' });
    expect(row!.attempts).toBe(1);
  });

  it('a worker that dies mid-send (service accepted, row never settled): after the lease the message is delivered exactly once', async () => {
    await enqueue(5);
    const real = new Resend(config.RESEND_API_KEY, { baseUrl: fake.url });
    let accepted = 0;
    // The dying worker: the service takes the message, then the process is gone (its promise never settles).
    const dying = {
      emails: {
        send: async (...args: Parameters<Resend['emails']['send']>) => {
          await real.emails.send(...args);
          accepted++;
          return new Promise<never>(() => undefined);
        },
      },
      batch: real.batch,
    } as unknown as Resend;
    void sender({}, dying).drain();
    const until = Date.now() + 10_000;
    while (accepted === 0 && Date.now() < until) await new Promise((r) => setTimeout(r, 50));
    expect(accepted).toBe(1);
    const [claimed] = await rows();
    expect(claimed!.state).toBe('sending');
    expect(delivered('backer5@example.org')).toHaveLength(1);

    // Another worker, before the lease ends: nothing to take.
    await sender().drain();
    expect((await rows())[0]!.attempts).toBe(1);
    // After the lease (5 s): it takes the row and sends it again under the same key.
    await new Promise((r) => setTimeout(r, 5200));
    await sender().drain();
    const [row] = await rows();
    expect(row!.state).toBe('sent');
    expect(row!.attempts).toBe(2);
    expect(delivered('backer5@example.org')).toHaveLength(1);
    expect(row!.providerId).toBe(delivered('backer5@example.org')[0]!.id);
  });

  it('two workers draining together send each of 60 messages exactly once', async () => {
    for (let n = 100; n < 160; n++) await enqueue(n);
    fake.faults.set({ delayMs: 5 });
    await Promise.all([sender().drain(), sender().drain()]);
    const r = await rows();
    expect(r.every((x) => x.state === 'sent')).toBe(true);
    expect(fake.messages()).toHaveLength(60);
    expect(new Set(fake.messages().map((m) => m.to[0])).size).toBe(60);
  });

  it('sends rows sharing a batch key in one batch call under that key, once, even when the batch is sent again', async () => {
    for (let n = 200; n < 230; n++) await enqueue(n, { batchKey: 'batch/a' });
    await sender().drain();
    const r = await rows();
    expect(r.every((x) => x.state === 'sent')).toBe(true);
    expect(new Set(fake.messages().map((m) => m.batch_id)).size).toBe(1);
    expect(fake.messages()).toHaveLength(30);
    // A worker that died after the batch was accepted, before its answer was written: the batch row's lease runs
    // out, and the batch is claimed again and re-sent under the same key.
    await database.db.execute(sql`update mail_queue set state = 'queued', provider_id = null`);
    await database.db.execute(sql`update mail_batches set state = 'sending', lease_until = now() - interval '1 second'`);
    await sender().drain();
    expect(fake.messages()).toHaveLength(30);
    const again = await rows();
    expect(again.every((x) => x.state === 'sent' && x.attempts === 2)).toBe(true);
    expect(new Set(again.map((x) => x.providerId))).toEqual(new Set(fake.messages().map((m) => m.id)));
  });

  it('claims a batch with one write to its batch row; a batch whose worker died mid-send is sent again once, under its key', async () => {
    for (let n = 600; n < 620; n++) await enqueue(n, { batchKey: 'batch/died' });
    const before = await rows();
    const real = new Resend(config.RESEND_API_KEY, { baseUrl: fake.url });
    let accepted = 0;
    // The dying worker: the service takes the batch, then the process is gone (its promise never settles).
    const dying = {
      emails: real.emails,
      batch: {
        send: async (...args: Parameters<Resend['batch']['send']>) => {
          await real.batch.send(...args);
          accepted++;
          return new Promise<never>(() => undefined);
        },
      },
    } as unknown as Resend;
    void sender({}, dying).drain();
    const until = Date.now() + 10_000;
    while (accepted === 0 && Date.now() < until) await new Promise((r) => setTimeout(r, 50));
    expect(accepted).toBe(1);
    expect(fake.messages()).toHaveLength(20);
    // In flight: the batch row holds the lease; its messages were not written at all.
    const [batch] = await database.db.select().from(mailBatches);
    expect(batch).toMatchObject({ key: 'batch/died', state: 'sending', attempts: 1 });
    expect(batch!.leaseUntil!.getTime()).toBeGreaterThan(Date.now());
    expect(await rows()).toEqual(before);
    // Another worker, before the lease ends: nothing to take.
    expect(await sender().drain()).toBe(0);
    // After the lease (5 s): it takes the batch and sends it again under the same key; the service answers as before.
    await new Promise((r) => setTimeout(r, 5200));
    expect(await sender().drain()).toBe(20);
    const r = await rows();
    expect(r.every((x) => x.state === 'sent' && x.attempts === 2)).toBe(true);
    expect(fake.messages()).toHaveLength(20);
    expect(new Set(fake.messages().map((m) => m.batch_id)).size).toBe(1);
    expect(r.map((x) => x.providerId).sort()).toEqual(
      fake
        .messages()
        .map((m) => m.id)
        .sort(),
    );
    expect((await database.db.select().from(mailBatches))[0]).toMatchObject({ state: 'sent', leaseUntil: null });
  });

  it('keeps at most MAIL_SEND_CONCURRENCY batch calls in flight, reaches that many, and sends each batch once', async () => {
    // 12 batches of 5; a batch whose worker died (lease run out) is among them and goes out too.
    for (let n = 300; n < 360; n++) await enqueue(n, { batchKey: `batch/${Math.floor((n - 300) / 5)}` });
    await database.db.execute(
      sql`update mail_batches set state = 'sending', attempts = 1, lease_until = now() - interval '1 second' where key = 'batch/7'`,
    );
    fake.faults.set({ delayMs: 30 });
    const resend = new Resend(config.RESEND_API_KEY, { baseUrl: config.RESEND_BASE_URL });
    const send = resend.batch.send.bind(resend.batch);
    let inFlight = 0;
    let most = 0;
    const keys: string[] = [];
    resend.batch.send = async (payload, options) => {
      most = Math.max(most, ++inFlight);
      keys.push(String(options?.idempotencyKey));
      try {
        return await send(payload, options);
      } finally {
        inFlight -= 1;
      }
    };
    expect(await sender({ MAIL_SEND_CONCURRENCY: 3 }, resend).drain()).toBe(60);
    expect(most).toBe(3);
    expect(keys.sort()).toEqual(Array.from({ length: 12 }, (_, i) => `batch/${i}`).sort());
    const r = await rows();
    expect(r.every((x) => x.state === 'sent' && x.leaseUntil === null && x.providerId)).toBe(true);
    expect(fake.messages()).toHaveLength(60);
    expect(new Set(fake.messages().map((m) => m.to[0])).size).toBe(60);
  });

  describe('copies that share stored data (mail_shared)', () => {
    const common = {
      title: 'Shared once',
      bodyMarkdown: 'The sail is **out**.',
      excerpt: 'The sail is out.',
      pageUrl: 'http://127.0.0.1:3999/dispatches/shared-once',
      siteUrl: 'http://127.0.0.1:3999/',
      charts: [],
      audienceLine: 'a backer',
      choicesUrl: 'http://127.0.0.1:3999/my-support/email',
    };
    const insertCopies = async (sharedKey: string, from: number, to: number, batchKey: string) => {
      await database.pool.query(`insert into mail_batches (key) values ($1) on conflict do nothing`, [batchKey]);
      for (let n = from; n < to; n++)
        await database.pool.query(
          `insert into mail_queue (idempotency_key, template, to_address, data, shared_key, category, batch_key)
           values ($1, 'dispatch', $2, $3::jsonb, $4, 'dispatch', $5)`,
          [
            `shared/${n}`,
            `reader${n}@example.org`,
            JSON.stringify({ unsubscribeUrl: `http://127.0.0.1:3999/unsubscribe?token=t${n}` }),
            sharedKey,
            batchKey,
          ],
        );
    };

    it('sends each copy with the shared part and its own link; a copy whose shared row is missing fails, naming it', async () => {
      await database.pool.query(`insert into mail_shared (key, template, data) values ('dispatch/s1', 'dispatch', $1::jsonb)`, [
        JSON.stringify(common),
      ]);
      await insertCopies('dispatch/s1', 400, 410, 'shared-batch/1');
      await insertCopies('dispatch/gone', 410, 412, 'shared-batch/2');
      await sender().drain();
      const r = await rows();
      expect(r.filter((x) => x.sharedKey === 'dispatch/s1').map((x) => x.state)).toEqual(Array(10).fill('sent'));
      const m = delivered('reader405@example.org');
      expect(m).toHaveLength(1);
      expect(m[0]!.subject).toContain('Shared once');
      expect(m[0]!.html).toContain('unsubscribe?token=t405');
      expect(m[0]!.text).toContain('The sail is out');
      expect(fake.messages().filter((x) => (x.html ?? '').includes('token=t40'))).toHaveLength(10);
      const gone = r.filter((x) => x.sharedKey === 'dispatch/gone');
      expect(gone.map((x) => x.state)).toEqual(['failed', 'failed']);
      expect(gone[0]!.lastAnswer).toMatchObject({ name: 'render_failed', message: expect.stringMatching(/dispatch\/gone/) });
    });

    it('housekeeping removes a shared row only once no message names it and it is a day old', async () => {
      const config = loadConfig({ NODE_ENV: 'test', DATABASE_URL: database.url, MAIL_QUEUE_KEEP_DAYS: '30' });
      await database.pool.query(
        `insert into mail_shared (key, template, data, created_at) values
           ('dispatch/old-named', 'dispatch', '{}', now() - interval '40 days'),
           ('dispatch/old-orphan', 'dispatch', '{}', now() - interval '2 days'),
           ('dispatch/new-orphan', 'dispatch', '{}', now())`,
      );
      await insertCopies('dispatch/old-named', 500, 501, 'shared-batch/3');
      // A sent copy past MAIL_QUEUE_KEEP_DAYS goes first, and its shared row with it in the same pass.
      await insertCopies('dispatch/old-sent', 501, 502, 'shared-batch/4');
      await database.pool.query(
        `insert into mail_shared (key, template, data, created_at) values ('dispatch/old-sent', 'dispatch', '{}', now() - interval '40 days')`,
      );
      await database.pool.query(
        `update mail_queue set state = 'sent', sent_at = now() - interval '31 days' where shared_key = 'dispatch/old-sent'`,
      );
      // Batch rows: one whose call ended before MAIL_QUEUE_KEEP_DAYS goes; a recent one and one still due stay.
      await database.pool.query(
        `update mail_batches set state = 'sent', updated_at = now() - interval '31 days' where key = 'shared-batch/4'`,
      );
      await database.pool.query(
        `insert into mail_batches (key, state, updated_at) values ('old-failed', 'failed', now() - interval '31 days'),
           ('new-sent', 'sent', now()), ('old-queued', 'queued', now() - interval '31 days')`,
      );
      const out = await runHousekeeping({ pool: database.pool, config }, ['mail']);
      expect(out.mail).toBe(5);
      const batches = await database.pool.query<{ key: string }>('select key from mail_batches order by key');
      expect(batches.rows.map((x) => x.key)).toEqual(['new-sent', 'old-queued', 'shared-batch/3']);
      const left = await database.pool.query<{ key: string }>('select key from mail_shared order by key');
      expect(left.rows.map((x) => x.key)).toEqual(['dispatch/new-orphan', 'dispatch/old-named']);
    });
  });
});
