import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { api, withQuery } from '@/lib/api-client';
import type { HistoryPage, HistoryParams } from '../types';
import { orbitKeys } from './keys';

export function historyPath(spacecraftId: string, params: Partial<HistoryParams>, csv = false) {
  return withQuery(`/api/orbit/spacecraft/${encodeURIComponent(spacecraftId)}/element-sets${csv ? '.csv' : ''}`, params);
}

export function getHistory({ spacecraftId, params, signal }: { spacecraftId: string; params: HistoryParams; signal?: AbortSignal }) {
  return api.get<HistoryPage>(historyPath(spacecraftId, params), { signal });
}

export function getHistoryQueryOptions(spacecraftId: string, params: HistoryParams) {
  return queryOptions({
    queryKey: orbitKeys.historyPage(spacecraftId, params),
    queryFn: ({ signal }) => getHistory({ spacecraftId, params, signal }),
    placeholderData: keepPreviousData,
  });
}

export function useHistory(spacecraftId: string, params: HistoryParams) {
  return useQuery(getHistoryQueryOptions(spacecraftId, params));
}
