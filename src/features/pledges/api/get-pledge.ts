import { queryOptions, useQuery } from '@tanstack/react-query';
import type { PledgeView } from '@shared/schemas/campaign';
import { api } from '@/lib/api-client';

export const pledgeKeys = {
  all: ['pledges'] as const,
  detail: (id: string) => [...pledgeKeys.all, id] as const,
};

export function getPledge(id: string, { signal }: { signal?: AbortSignal } = {}) {
  return api.get<{ pledge: PledgeView }>(`/api/pledges/${encodeURIComponent(id)}`, { signal }).then((r) => r.pledge);
}

/** While the processor's webhook has not landed the pledge is still "started": poll every 1.5 s, for 2 minutes at most. */
export function getPledgeQueryOptions(id: string, { poll = false }: { poll?: boolean } = {}) {
  return queryOptions({
    queryKey: pledgeKeys.detail(id),
    queryFn: ({ signal }) => getPledge(id, { signal }),
    staleTime: 0,
    refetchInterval: (query) => (poll && query.state.data?.state === 'started' && query.state.dataUpdateCount < 80 ? 1500 : false),
  });
}

export function usePledge(id: string, opts: { poll?: boolean } = {}) {
  return useQuery(getPledgeQueryOptions(id, opts));
}
