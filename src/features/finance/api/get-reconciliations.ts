import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { booksKeys } from './keys';

export type ReconRun = {
  id: string;
  status: 'queued' | 'running' | 'done' | 'failed';
  from: string;
  to: string;
  progress: number;
  progressLabel: string;
  /** Steps: one per day fetched from the processor, then matching, then payouts. */
  stepsDone: number;
  stepsTotal: number;
  fetchedCount: number;
  attempts: number;
  summary: { fetched: number; matched: number; findings: Record<string, number> } | null;
  error: string | null;
  createdAt: string;
};
export type Finding = {
  id: number;
  kind: string;
  subjectKey: string;
  processorObjectId: string | null;
  processorAmountMinor: number | null;
  ledgerAmountMinor: number | null;
  currency: string | null;
  resolution: { action: string; note: string } | null;
};

export const getReconciliations = ({ signal }: { signal?: AbortSignal } = {}) =>
  api.get<{ runs: ReconRun[] }>('/api/books/reconciliations', { signal }).then((r) => r.runs);
export const getReconciliationsQueryOptions = () =>
  queryOptions({ queryKey: booksKeys.runs(), queryFn: ({ signal }) => getReconciliations({ signal }) });
export const useReconciliations = () => useQuery(getReconciliationsQueryOptions());
