import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { api, withQuery } from '@/lib/api-client';
import type { TrendView } from '../types';
import { orbitKeys } from './keys';

/** The chart's view (viewFrom, viewTo; the whole history when absent) and its pixel columns. */
export type TrendViewParams = { viewFrom?: string; viewTo?: string; columns?: number };

export function getTrendView({ spacecraftId, signal, ...params }: TrendViewParams & { spacecraftId: string; signal?: AbortSignal }) {
  return api.get<TrendView>(
    withQuery(`/api/orbit/spacecraft/${encodeURIComponent(spacecraftId)}/trend/view`, {
      ...params,
      columns: params.columns === undefined ? undefined : String(params.columns),
    }),
    { signal },
  );
}

export function getTrendViewQueryOptions(spacecraftId: string, params: TrendViewParams) {
  return queryOptions({
    queryKey: orbitKeys.trendView(spacecraftId, params),
    queryFn: ({ signal }) => getTrendView({ spacecraftId, ...params, signal }),
    // While a zoomed view loads, the chart keeps drawing the points it has at the new scale.
    placeholderData: keepPreviousData,
    // Each view is a new reply of a few thousand numbers per series: comparing it deeply with the last one (to keep
    // equal parts) costs a main-thread pass and saves nothing the chart could use.
    structuralSharing: false,
  });
}

export function useTrendView(spacecraftId: string, params: TrendViewParams) {
  return useQuery(getTrendViewQueryOptions(spacecraftId, params));
}
