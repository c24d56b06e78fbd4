// Set-up for the books tests: the pledge world plus a finance agent and helpers to run reconciliations.
import { expect } from 'vitest';
import { createWorld, settle, signedInAgent, type World } from './pledges-fixtures';
import type { Agent } from '../setup/test-app';

export type BooksWorld = World & { finance: Agent };

export async function createBooksWorld(env: Record<string, string> = {}): Promise<BooksWorld> {
  const w = await createWorld(env);
  const finance = await signedInAgent(w, 'finance@saltmarsh.example');
  return Object.assign(w, { finance });
}

const day = (offsetDays: number) => new Date(Date.now() + offsetDays * 86_400_000).toISOString().slice(0, 10);

/**
 * Starts a reconciliation over a range wide enough for the fake clock (which tests may advance), runs its job
 * here (the queue's own handler, fetched from pg-boss as a worker would) and answers the finished run.
 */
export async function reconcile(w: BooksWorld, range = { from: day(-2), to: day(20) }) {
  await settle(w);
  const started = await w.finance.post('/api/books/reconciliations').set('x-csrf-token', w.finance.csrf).send(range);
  expect(started.status, JSON.stringify(started.body)).toBe(202);
  expect(started.body.run.status).toBe('queued');
  expect(await w.t.jobs.runPending('books-reconcile')).toBe(1);
  const res = await w.finance.get(`/api/books/reconciliations/${started.body.run.id}`);
  expect(res.body.run.status, res.body.run.error ?? '').toBe('done');
  return res.body as {
    run: {
      id: string;
      summary: {
        fetched: number;
        matched: number;
        findings: Record<string, number>;
        totals: Record<string, number | string>[];
        payouts: unknown[];
      };
    };
    findings: {
      id: number;
      kind: string;
      subjectKey: string;
      processorObjectId: string | null;
      processorAmountMinor: number | null;
      ledgerAmountMinor: number | null;
      currency: string | null;
      details: Record<string, unknown>;
      resolution: { action: string } | null;
    }[];
  };
}

/** The findings as short comparable facts. */
export const brief = (findings: Awaited<ReturnType<typeof reconcile>>['findings']) =>
  findings.map((f) => ({
    kind: f.kind,
    object: f.processorObjectId,
    processor: f.processorAmountMinor,
    ledger: f.ledgerAmountMinor,
    currency: f.currency,
  }));

export async function refund(w: BooksWorld, pledgeId: string, body: Record<string, unknown>) {
  return w.finance.post(`/api/books/pledges/${pledgeId}/refunds`).set('x-csrf-token', w.finance.csrf).send(body);
}
