import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import type { SailingPeriod } from '../types';
import { orbitKeys } from './keys';

export function getSailingPeriods({ spacecraftId, signal }: { spacecraftId: string; signal?: AbortSignal }) {
  return api.get<{ sailingPeriods: SailingPeriod[] }>(`/api/orbit/spacecraft/${encodeURIComponent(spacecraftId)}/sailing-periods`, {
    signal,
  });
}

export function getSailingPeriodsQueryOptions(spacecraftId: string) {
  return queryOptions({
    queryKey: orbitKeys.sailingPeriods(spacecraftId),
    queryFn: ({ signal }) => getSailingPeriods({ spacecraftId, signal }),
  });
}

export function useSailingPeriods(spacecraftId: string) {
  return useQuery(getSailingPeriodsQueryOptions(spacecraftId));
}
