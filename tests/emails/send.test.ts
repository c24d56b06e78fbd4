import { Resend } from 'resend';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { createMailer, MailDeliveryError } from '../../emails/send';
import { createMailFake, type MailFake } from '../../fakes/mail/server';

const data = { displayName: 'Wren', verifyUrl: 'http://127.0.0.1:3000/verify?token=t1' };

describe('mailer over the resend SDK and the mail fake', () => {
  let fake: MailFake;
  let waits: number[];
  const sleep = async (ms: number) => {
    waits.push(ms);
  };
  beforeAll(async () => {
    fake = await createMailFake({ apiKey: 're_mailer_test' });
  });
  afterAll(async () => {
    await fake.close();
  });
  beforeEach(() => {
    fake.clear();
    fake.faults.set({ rateLimitNext: 0, failNext: 0 });
    waits = [];
  });
  const mailer = (key = 're_mailer_test') =>
    createMailer({ resend: new Resend(key, { baseUrl: fake.url }), from: 'Lightkeel <no-reply@lightkeel.example.org>', sleep });

  it('renders the template and sends HTML and text parts', async () => {
    const { id } = await mailer().send('verify-email', 'wren.backer@example.org', data);
    const [m] = fake.messages();
    expect(m?.id).toBe(id);
    expect(m?.to).toEqual(['wren.backer@example.org']);
    expect(m?.subject).toMatch(/Confirm your e-mail/);
    expect(m?.html).toContain('http://127.0.0.1:3000/verify?token=t1');
    expect(m?.text).toContain('http://127.0.0.1:3000/verify?token=t1');
    expect(m?.tags).toEqual([{ name: 'template', value: 'verify-email' }]);
  });

  it('retries once after a 429, waiting the retry-after seconds', async () => {
    fake.faults.set({ rateLimitNext: 1 });
    await mailer().send('verify-email', 'a@example.org', data);
    expect(waits).toEqual([1000]);
    expect(fake.messages()).toHaveLength(1);
  });

  it('retries once after a 500 and sends the message only once', async () => {
    fake.faults.set({ failNext: 1 });
    await mailer().send('verify-email', 'a@example.org', data);
    expect(waits).toHaveLength(1);
    expect(fake.messages()).toHaveLength(1);
  });

  it('throws MailDeliveryError with the status when the retry fails too', async () => {
    fake.faults.set({ failNext: 2 });
    const err = await mailer()
      .send('verify-email', 'a@example.org', data)
      .catch((e: unknown) => e);
    expect(err).toBeInstanceOf(MailDeliveryError);
    expect((err as MailDeliveryError).status).toBe(500);
    expect((err as MailDeliveryError).code).toBe('internal_server_error');
    expect(fake.messages()).toHaveLength(0);
  });

  it('does not retry a refused key or an invalid address', async () => {
    const badKey = await mailer('re_nope')
      .send('verify-email', 'a@example.org', data)
      .catch((e: unknown) => e);
    expect(badKey).toMatchObject({ status: 403, code: 'invalid_api_key' });
    const badTo = await mailer()
      .send('verify-email', 'not-an-address', data)
      .catch((e: unknown) => e);
    expect(badTo).toMatchObject({ status: 400, code: 'validation_error' });
    expect(waits).toEqual([]);
  });
});
