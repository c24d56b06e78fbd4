import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { api, withQuery } from '@/lib/api-client';
import type { Trend } from '../types';
import { orbitKeys } from './keys';

/** The rate window (from, to), the chart's view (viewFrom, viewTo) and its pixel columns. */
export type TrendParams = { from?: string; to?: string; viewFrom?: string; viewTo?: string; columns?: number };

export function getTrend({ spacecraftId, signal, ...params }: TrendParams & { spacecraftId: string; signal?: AbortSignal }) {
  return api.get<Trend>(
    withQuery(`/api/orbit/spacecraft/${encodeURIComponent(spacecraftId)}/trend`, {
      ...params,
      columns: params.columns === undefined ? undefined : String(params.columns),
    }),
    { signal },
  );
}

export function getTrendQueryOptions(spacecraftId: string, params: TrendParams) {
  return queryOptions({
    queryKey: orbitKeys.trendWindow(spacecraftId, params),
    queryFn: ({ signal }) => getTrend({ spacecraftId, ...params, signal }),
    // While a zoomed view loads, the chart keeps drawing the points it has at the new scale.
    placeholderData: keepPreviousData,
    // Each view is a new reply of a few thousand numbers per series: comparing it deeply with the last one (to keep
    // equal parts) costs a main-thread pass and saves nothing the chart could use.
    structuralSharing: false,
  });
}

export function useTrend(spacecraftId: string, params: TrendParams) {
  return useQuery(getTrendQueryOptions(spacecraftId, params));
}
