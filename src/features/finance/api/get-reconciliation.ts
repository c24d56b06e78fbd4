import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { booksKeys } from './keys';
import type { Finding, ReconRun } from './get-reconciliations';

export const getReconciliation = (id: string, { signal }: { signal?: AbortSignal } = {}) =>
  api.get<{ run: ReconRun; findings: Finding[] }>(`/api/books/reconciliations/${id}`, { signal });
export const getReconciliationQueryOptions = (id: string) =>
  queryOptions({
    queryKey: booksKeys.run(id),
    queryFn: ({ signal }) => getReconciliation(id, { signal }),
    refetchInterval: (q) => (q.state.data && ['queued', 'running'].includes(q.state.data.run.status) ? 1000 : false),
  });
export const useReconciliation = (id: string | null) => useQuery({ ...getReconciliationQueryOptions(id ?? ''), enabled: Boolean(id) });
