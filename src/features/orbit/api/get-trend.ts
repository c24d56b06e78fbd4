import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { api, withQuery } from '@/lib/api-client';
import type { Trend } from '../types';
import { orbitKeys } from './keys';

export function getTrend({ spacecraftId, from, to, signal }: { spacecraftId: string; from?: string; to?: string; signal?: AbortSignal }) {
  return api.get<Trend>(withQuery(`/api/orbit/spacecraft/${encodeURIComponent(spacecraftId)}/trend`, { from, to }), { signal });
}

export function getTrendQueryOptions(spacecraftId: string, window: { from?: string; to?: string }) {
  return queryOptions({
    queryKey: orbitKeys.trendWindow(spacecraftId, window),
    queryFn: ({ signal }) => getTrend({ spacecraftId, ...window, signal }),
    placeholderData: keepPreviousData,
  });
}

export function useTrend(spacecraftId: string, window: { from?: string; to?: string }) {
  return useQuery(getTrendQueryOptions(spacecraftId, window));
}
