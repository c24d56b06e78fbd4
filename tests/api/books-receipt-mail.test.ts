// The receipt PDF goes with the pledge confirmation (through the mail queue and the resend SDK, kept by the
// mail fake as the service's API takes it: base64 `content`, `filename`, `content_type`), and the backer can
// download it from my support; nobody else can.
import { afterEach, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { paidPledge, signedInAgent } from './pledges-fixtures';
import { createBooksWorld, type BooksWorld } from './books-fixtures';
import { mailQueue } from '../../server/modules/mail/mail.tables';
import { receipts } from '../../server/modules/books/books.tables';
import { agentFor } from '../setup/test-app';

let w: BooksWorld | undefined;
afterEach(async () => {
  await w?.close();
  w = undefined;
});

const binary = (req: ReturnType<BooksWorld['backer']['get']>) =>
  req.buffer(true).parse((res, cb) => {
    const chunks: Buffer[] = [];
    res.on('data', (c: Buffer) => chunks.push(c));
    res.on('end', () => cb(null, Buffer.concat(chunks)));
  });

describe('receipt PDF with the confirmation and in my support', () => {
  it('attaches the payment receipt to the confirmation e-mail, as a base64 PDF the mail service accepts', async () => {
    w = await createBooksWorld();
    const { id } = await paidPledge(w, w.backer, { tierId: w.tier.patch.id, amountMinor: 2500 });
    const [receipt] = await w.t.database.db.select().from(receipts).where(eq(receipts.pledgeId, id));
    expect(receipt).toBeTruthy();
    const [row] = await w.t.database.db
      .select()
      .from(mailQueue)
      .where(eq(mailQueue.idempotencyKey, `pledge-confirmation/${id}`));
    // The outbox row holds a reference; the bytes are rendered when the message is sent.
    expect(row!.attachments).toEqual([{ kind: 'receipt', receiptId: receipt!.id }]);

    await w.t.flushMail();
    const sent = w.t.mail.messages().filter((m) => m.to.includes('backer@saltmarsh.example') && /Thank you/i.test(m.subject));
    expect(sent).toHaveLength(1);
    const [att] = sent[0]!.attachments;
    const filename = `receipt-${String(receipt!.number).padStart(6, '0')}.pdf`;
    expect(att).toMatchObject({ filename, content_type: 'application/pdf', content_id: null, path: null });
    const bytes = Buffer.from(att!.content!, 'base64');
    expect(bytes.subarray(0, 5).toString()).toBe('%PDF-');
    expect(att!.size).toBe(bytes.length);
    expect(bytes.length).toBeGreaterThan(1500);
    // pdfkit ends every file with its cross-reference trailer.
    expect(bytes.subarray(-6).toString()).toContain('%%EOF');

    // The same receipt as the backer downloads it from my support (same number in the file name).
    const dl = await binary(w.backer.get(`/api/receipts/by-payment/${receipt!.ledgerEntryId}.pdf`));
    expect(dl.status).toBe(200);
    expect(dl.headers['content-type']).toBe('application/pdf');
    expect(dl.headers['content-disposition']).toBe(`attachment; filename="${filename}"`);
    expect((dl.body as Buffer).subarray(0, 5).toString()).toBe('%PDF-');
  }, 90_000);

  it('lets only the backer (and books staff) download a receipt from my support', async () => {
    w = await createBooksWorld();
    const { id } = await paidPledge(w, w.backer, { tierId: w.tier.patch.id, amountMinor: 3000 });
    const [receipt] = await w.t.database.db.select().from(receipts).where(eq(receipts.pledgeId, id));
    const url = `/api/receipts/by-payment/${receipt!.ledgerEntryId}.pdf`;
    const byId = `/api/receipts/${receipt!.id}.pdf`;
    const status = async (agent: ReturnType<typeof agentFor>, u: string) => (await agent.get(u)).status;

    expect(await status(w.backer, url)).toBe(200);
    expect(await status(w.backer, byId)).toBe(200);
    for (const email of ['outreach@saltmarsh.example', 'engineer@saltmarsh.example']) {
      const other = await signedInAgent(w, email);
      // Not theirs: answered as if it did not exist (no hint that the number is in use).
      expect(await status(other, url), email).toBe(404);
      expect(await status(other, byId), email).toBe(404);
    }
    expect(await status(w.finance, url)).toBe(200);
    const admin = await signedInAgent(w, 'admin@saltmarsh.example');
    expect(await status(admin, url)).toBe(200);
    const anon = agentFor(w.t.app);
    expect(await status(anon, url)).toBe(401);
    // A payment number that does not exist at all answers the same as someone else's.
    expect(await status(w.backer, `/api/receipts/by-payment/${(receipt!.ledgerEntryId ?? 0) + 999}.pdf`)).toBe(404);
  }, 90_000);
});
