import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { api, withQuery } from '@/lib/api-client';
import type { TrendRateWindow } from '../types';
import { orbitKeys } from './keys';

/** The rate window (from, to); the last 30 days of the history when absent. */
export type TrendRatesParams = { from?: string; to?: string };

export function getTrendRates({ spacecraftId, signal, ...params }: TrendRatesParams & { spacecraftId: string; signal?: AbortSignal }) {
  return api.get<TrendRateWindow>(withQuery(`/api/orbit/spacecraft/${encodeURIComponent(spacecraftId)}/trend/rates`, params), {
    signal,
  });
}

export function getTrendRatesQueryOptions(spacecraftId: string, params: TrendRatesParams) {
  return queryOptions({
    queryKey: orbitKeys.trendRates(spacecraftId, params),
    queryFn: ({ signal }) => getTrendRates({ spacecraftId, ...params, signal }),
    // A new window keeps the last rates on screen until its own fit comes.
    placeholderData: keepPreviousData,
  });
}

export function useTrendRates(spacecraftId: string, params: TrendRatesParams) {
  return useQuery(getTrendRatesQueryOptions(spacecraftId, params));
}
