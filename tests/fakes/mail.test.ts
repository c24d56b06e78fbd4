import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { Resend } from 'resend';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { createMailFake, type MailFake } from '../../fakes/mail/server';

const KEY = 're_test_key_1';
const FROM = 'Lightkeel <mission@lightkeel.example.org>';

describe('mail fake driven through the resend SDK', () => {
  let fake: MailFake;
  let resend: Resend;
  beforeAll(async () => {
    fake = await createMailFake({ port: 0, apiKey: KEY });
    resend = new Resend(KEY, { baseUrl: fake.url });
  });
  afterAll(async () => {
    await fake.close();
  });
  beforeEach(() => {
    fake.clear();
    fake.faults.set({ rateLimitNext: 0, failNext: 0 });
  });

  it('accepts a message, keeps it, and returns it from GET /emails/:id in the service shape', async () => {
    const { data, error } = await resend.emails.send({
      from: FROM,
      to: 'wren.backer@example.org',
      cc: ['Crew Desk <crew@example.org>'],
      subject: 'Tern-1 sail deployed',
      html: '<p>The sail is out.</p>',
      text: 'The sail is out.',
      replyTo: 'reply@example.org',
      headers: { 'X-Lightkeel-Template': 'dispatch' },
      tags: [{ name: 'template', value: 'dispatch' }],
    });
    expect(error).toBeNull();
    expect(data?.id).toMatch(/^[0-9a-f-]{36}$/);

    const stored = fake.messages();
    expect(stored).toHaveLength(1);
    expect(stored[0]).toMatchObject({
      id: data?.id,
      from: FROM,
      to: ['wren.backer@example.org'],
      cc: ['Crew Desk <crew@example.org>'],
      reply_to: ['reply@example.org'],
      subject: 'Tern-1 sail deployed',
      headers: { 'X-Lightkeel-Template': 'dispatch' },
      tags: [{ name: 'template', value: 'dispatch' }],
    });

    const got = await resend.emails.get(data?.id ?? '');
    expect(got.error).toBeNull();
    expect(got.data).toMatchObject({
      object: 'email',
      id: data?.id,
      to: ['wren.backer@example.org'],
      from: FROM,
      subject: 'Tern-1 sail deployed',
      html: '<p>The sail is out.</p>',
      text: 'The sail is out.',
      last_event: 'delivered',
      bcc: null,
    });
    expect(Number.isNaN(Date.parse(got.data?.created_at ?? ''))).toBe(false);
  });

  it('keeps attachments as the SDK sends them (base64 content, filename, content_type) and serves them back', async () => {
    const bytes = Buffer.from('%PDF-1.3\n% a tiny stand-in for a receipt\n%%EOF\n');
    const { data, error } = await resend.emails.send({
      from: FROM,
      to: 'wren.backer@example.org',
      subject: 'Your receipt',
      text: 'Attached.',
      attachments: [{ filename: 'receipt-000001.pdf', content: bytes, contentType: 'application/pdf' }],
    });
    expect(error).toBeNull();
    const [m] = fake.messages();
    expect(m!.attachments).toEqual([
      {
        filename: 'receipt-000001.pdf',
        content_type: 'application/pdf',
        content_id: null,
        path: null,
        content: bytes.toString('base64'),
        size: bytes.length,
      },
    ]);
    const served = await fetch(`${fake.url}/outbox/${data!.id}/attachments/0`);
    expect(served.headers.get('content-type')).toBe('application/pdf');
    expect(Buffer.from(await served.arrayBuffer())).toEqual(bytes);
    // Content that is not base64 text (e.g. a Buffer serialised as JSON by hand) is refused, as the service does.
    const raw = await fetch(`${fake.url}/emails`, {
      method: 'POST',
      headers: { authorization: `Bearer ${KEY}`, 'content-type': 'application/json' },
      body: JSON.stringify({
        from: FROM,
        to: 'a@example.org',
        subject: 's',
        text: 'x',
        attachments: [{ filename: 'a.pdf', content: '%PDF not base64!' }],
      }),
    });
    expect(raw.status).toBe(400);
    expect(((await raw.json()) as { name: string; message: string }).message).toContain('attachments[0].content');
  });

  it('answers an unknown id with not_found and a malformed one with invalid_parameter', async () => {
    const missing = await resend.emails.get('00000000-0000-4000-8000-000000000000');
    expect(missing.data).toBeNull();
    expect(missing.error).toMatchObject({ name: 'not_found', statusCode: 404 });
    const bad = await resend.emails.get('not-a-uuid');
    expect(bad.error).toMatchObject({ name: 'invalid_parameter', statusCode: 422 });
  });

  it('sends a strict batch and returns one id per e-mail', async () => {
    const { data, error } = await resend.batch.send([
      { from: FROM, to: ['a@example.org'], subject: 'one', text: 'first' },
      { from: FROM, to: ['b@example.org'], subject: 'two', html: '<b>second</b>' },
    ]);
    expect(error).toBeNull();
    expect(data?.data).toHaveLength(2);
    const ids = fake.messages().map((m) => m.id);
    expect(new Set(ids)).toEqual(new Set(data?.data.map((d) => d.id)));
    expect(fake.messages().every((m) => m.batch_id && m.batch_id === fake.messages()[0]?.batch_id)).toBe(true);
  });

  it('rejects a whole strict batch when one e-mail is invalid, but sends the valid ones in permissive mode', async () => {
    const emails = [
      { from: FROM, to: ['a@example.org'], subject: 'ok', text: 'fine' },
      { from: FROM, to: ['not an address'], subject: 'bad', text: 'broken' },
    ];
    const strict = await resend.batch.send(emails);
    expect(strict.data).toBeNull();
    expect(strict.error).toMatchObject({ name: 'validation_error', statusCode: 400 });
    expect(strict.error?.message).toMatch(/emails\[1\].*`to`/);
    expect(fake.messages()).toHaveLength(0);

    const permissive = await resend.batch.send(emails, { batchValidation: 'permissive' });
    expect(permissive.error).toBeNull();
    expect(permissive.data?.data).toHaveLength(1);
    expect(permissive.data?.errors).toEqual([{ index: 1, message: expect.stringMatching(/`to`/) }]);
    expect(fake.messages().map((m) => m.subject)).toEqual(['ok']);
  });

  it('refuses a batch of more than 100 e-mails and accepts exactly 100', async () => {
    const one = (i: number) => ({ from: FROM, to: [`b${i}@example.org`], subject: `n${i}`, text: 'x' });
    const tooMany = await resend.batch.send(Array.from({ length: 101 }, (_, i) => one(i)));
    expect(tooMany.data).toBeNull();
    expect(tooMany.error).toMatchObject({ name: 'validation_error', statusCode: 400 });
    expect(tooMany.error?.message).toMatch(/101.*100/);
    expect(fake.messages()).toHaveLength(0);

    const full = await resend.batch.send(Array.from({ length: 100 }, (_, i) => one(i)));
    expect(full.error).toBeNull();
    expect(full.data?.data).toHaveLength(100);
  });

  it('validates single sends like the service: required fields, html or text, 50 recipients, addresses', async () => {
    const noSubject = await resend.emails.send({ from: FROM, to: 'a@example.org', text: 'x' } as unknown as Parameters<
      typeof resend.emails.send
    >[0]);
    expect(noSubject.data).toBeNull();
    expect(noSubject.error).toMatchObject({ name: 'missing_required_field', statusCode: 422 });
    expect(noSubject.error?.message).toMatch(/subject/);

    const noBody = await resend.emails.send({ from: FROM, to: 'a@example.org', subject: 's' } as unknown as Parameters<
      typeof resend.emails.send
    >[0]);
    expect(noBody.error).toMatchObject({ name: 'missing_required_field', statusCode: 422 });
    expect(noBody.error?.message).toMatch(/html.*text/);

    const noFrom = await resend.emails.send({ to: 'a@example.org', subject: 's', text: 'x' } as unknown as Parameters<
      typeof resend.emails.send
    >[0]);
    expect(noFrom.error).toMatchObject({ name: 'missing_required_field', statusCode: 422 });

    const fiftyOne = Array.from({ length: 51 }, (_, i) => `r${i}@example.org`);
    const tooMany = await resend.emails.send({ from: FROM, to: fiftyOne, subject: 's', text: 'x' });
    expect(tooMany.error).toMatchObject({ name: 'validation_error', statusCode: 400 });
    expect(tooMany.error?.message).toMatch(/51.*50/);
    const fifty = await resend.emails.send({ from: FROM, to: fiftyOne.slice(0, 50), subject: 's', text: 'x' });
    expect(fifty.error).toBeNull();

    for (const to of ['nobody', 'a@b', 'two@example.org, three@example.org', 'Name <broken>']) {
      const bad = await resend.emails.send({ from: FROM, to, subject: 's', text: 'x' });
      expect(bad.error, to).toMatchObject({ name: 'validation_error', statusCode: 400 });
    }
    const badFrom = await resend.emails.send({ from: 'Lightkeel', to: 'a@example.org', subject: 's', text: 'x' });
    expect(badFrom.error?.message).toMatch(/`from`/);
    expect(fake.messages()).toHaveLength(1);
  });

  it('checks the API key: missing → 401 missing_api_key, wrong → 403 invalid_api_key', async () => {
    const wrong = new Resend('re_wrong', { baseUrl: fake.url });
    const res = await wrong.emails.send({ from: FROM, to: 'a@example.org', subject: 's', text: 'x' });
    expect(res.error).toMatchObject({ name: 'invalid_api_key', statusCode: 403 });

    const bare = await fetch(`${fake.url}/emails`, {
      method: 'POST',
      headers: { 'content-type': 'application/json' },
      body: JSON.stringify({ from: FROM, to: 'a@example.org', subject: 's', text: 'x' }),
    });
    expect(bare.status).toBe(401);
    expect(await bare.json()).toMatchObject({ statusCode: 401, name: 'missing_api_key' });
    expect(fake.messages()).toHaveLength(0);
  });

  it('injects 429 with retry-after and 500 faults for the next n requests, then recovers', async () => {
    const msg = { from: FROM, to: 'a@example.org', subject: 's', text: 'x' };
    const set = await fetch(`${fake.url}/_fake/faults`, {
      method: 'POST',
      headers: { 'content-type': 'application/json' },
      body: JSON.stringify({ rateLimitNext: 1, failNext: 2 }),
    });
    expect(await set.json()).toEqual({ rateLimitNext: 1, failNext: 2, delayMs: 0, retryAfterSeconds: 1 });

    const limited = await resend.emails.send(msg);
    expect(limited.error).toMatchObject({ name: 'rate_limit_exceeded', statusCode: 429 });
    expect(limited.headers?.['retry-after']).toBe('1');
    for (let i = 0; i < 2; i++) {
      const failed = await resend.emails.send(msg);
      expect(failed.error).toMatchObject({ name: 'internal_server_error', statusCode: 500 });
    }
    expect(fake.messages()).toHaveLength(0);
    const ok = await resend.emails.send(msg);
    expect(ok.error).toBeNull();
    expect(fake.messages()).toHaveLength(1);

    const badFault = await fetch(`${fake.url}/_fake/faults`, {
      method: 'POST',
      headers: { 'content-type': 'application/json' },
      body: JSON.stringify({ failNext: -1 }),
    });
    expect(badFault.status).toBe(400);

    // A slow service: every request waits delayMs; and a longer Retry-After on the next 429.
    fake.faults.set({ delayMs: 300, rateLimitNext: 1, retryAfterSeconds: 30 });
    const started = Date.now();
    const slow = await resend.emails.send(msg);
    expect(Date.now() - started).toBeGreaterThanOrEqual(295);
    expect(slow.headers?.['retry-after']).toBe('30');
    fake.faults.set({ delayMs: 0, retryAfterSeconds: 1 });
  });

  it('honours Idempotency-Key: same payload replays the first id, other payload is a conflict', async () => {
    const msg = { from: FROM, to: 'a@example.org', subject: 'once', text: 'x' };
    const first = await resend.emails.send(msg, { idempotencyKey: 'reset/42' });
    const again = await resend.emails.send(msg, { idempotencyKey: 'reset/42' });
    expect(again.data?.id).toBe(first.data?.id);
    expect(fake.messages()).toHaveLength(1);
    const other = await resend.emails.send({ ...msg, subject: 'different' }, { idempotencyKey: 'reset/42' });
    expect(other.error).toMatchObject({ name: 'invalid_idempotent_request', statusCode: 409 });
    const long = await resend.emails.send(msg, { idempotencyKey: 'k'.repeat(257) });
    expect(long.error).toMatchObject({ name: 'invalid_idempotency_key', statusCode: 400 });
  });

  it('filters stored messages by recipient over GET /_fake/messages, newest first', async () => {
    await resend.emails.send({ from: FROM, to: 'Wren <Wren.Backer@example.org>', subject: 'first', text: 'x' });
    await resend.emails.send({ from: FROM, to: 'other@example.org', subject: 'noise', text: 'x' });
    await resend.emails.send({ from: FROM, to: 'wren.backer@example.org', subject: 'second', text: 'x' });
    const res = await fetch(`${fake.url}/_fake/messages?to=${encodeURIComponent('wren.backer@example.org')}`);
    const body = (await res.json()) as { data: Array<{ subject: string }> };
    expect(body.data.map((m) => m.subject)).toEqual(['second', 'first']);
  });

  it('lists a sent message on the outbox page and shows its headers, sandboxed HTML and text part', async () => {
    const { data } = await resend.emails.send({
      from: FROM,
      to: 'wren.backer@example.org',
      subject: 'Outbox <check> & more',
      html: '<h1 id="x">Hello from the sail</h1><script>alert(1)</script>',
      text: 'Hello from the sail, in plain text.',
      headers: { 'X-Entity-Ref': 'ref-77' },
    });
    const id = data?.id ?? '';
    for (const path of ['/', '/outbox']) {
      const list = await fetch(`${fake.url}${path}`);
      expect(list.status).toBe(200);
      expect(list.headers.get('content-type')).toMatch(/text\/html/);
      const page = await list.text();
      expect(page).toContain(`href="/outbox/${id}"`);
      expect(page).toContain('Outbox &lt;check&gt; &amp; more');
      expect(page).not.toContain('<check>');
      expect(page).toContain('wren.backer@example.org');
      expect(page).toMatch(/<html lang="en">/);
    }
    const detail = await (await fetch(`${fake.url}/outbox/${id}`)).text();
    expect(detail).toContain('X-Entity-Ref');
    expect(detail).toContain('ref-77');
    expect(detail).toContain('Hello from the sail, in plain text.');
    expect(detail).toMatch(new RegExp(`<iframe src="/outbox/${id}/html" sandbox=""`));
    expect(detail).not.toContain('<script>');

    const html = await fetch(`${fake.url}/outbox/${id}/html`);
    expect(html.headers.get('content-security-policy')).toMatch(/^sandbox;/);
    expect(await html.text()).toContain('<h1 id="x">Hello from the sail</h1>');
    expect((await fetch(`${fake.url}/outbox/00000000-0000-4000-8000-000000000000`)).status).toBe(404);
  });
});

describe('mail fake state file', () => {
  it('keeps messages across a restart when a state path is given', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'mail-fake-'));
    const statePath = join(dir, 'nested', 'mail.json');
    try {
      const first = await createMailFake({ statePath });
      const sdk = new Resend('re_lightkeel_local', { baseUrl: first.url });
      const { data } = await sdk.emails.send({ from: FROM, to: 'keep@example.org', subject: 'kept', text: 'x' });
      await first.close();
      expect(JSON.parse(readFileSync(statePath, 'utf8')).messages[0].id).toBe(data?.id);

      const second = await createMailFake({ statePath });
      try {
        expect(second.messages().map((m) => m.id)).toEqual([data?.id]);
        const got = await new Resend('re_lightkeel_local', { baseUrl: second.url }).emails.get(data?.id ?? '');
        expect(got.data?.subject).toBe('kept');
      } finally {
        await second.close();
      }
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });
});
