import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import type { Spacecraft } from '../types';
import { orbitKeys } from './keys';

export function getSpacecraft({ signal }: { signal?: AbortSignal } = {}) {
  return api.get<{ spacecraft: Spacecraft[] }>('/api/orbit/spacecraft', { signal });
}

export function getSpacecraftQueryOptions() {
  return queryOptions({ queryKey: orbitKeys.spacecraft(), queryFn: ({ signal }) => getSpacecraft({ signal }) });
}

export function useSpacecraft() {
  return useQuery(getSpacecraftQueryOptions());
}
