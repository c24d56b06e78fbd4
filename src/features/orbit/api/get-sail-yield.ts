import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import type { SailYield } from '../types';
import { orbitKeys } from './keys';

export function getSailYield({ spacecraftId, signal }: { spacecraftId: string; signal?: AbortSignal }) {
  return api.get<SailYield>(`/api/orbit/spacecraft/${encodeURIComponent(spacecraftId)}/sail-yield`, { signal });
}

export function getSailYieldQueryOptions(spacecraftId: string) {
  return queryOptions({ queryKey: orbitKeys.sailYield(spacecraftId), queryFn: ({ signal }) => getSailYield({ spacecraftId, signal }) });
}

export function useSailYield(spacecraftId: string) {
  return useQuery(getSailYieldQueryOptions(spacecraftId));
}
