import { queryOptions, useQuery } from '@tanstack/react-query';
import type { DispatchSummary } from '@shared/schemas/dispatch';
import { api } from '@/lib/api-client';
import { dispatchKeys } from './keys';

export function getDispatches({ signal }: { signal?: AbortSignal }) {
  return api.get<{ dispatches: DispatchSummary[] }>('/api/dispatches', { signal });
}
export const getDispatchesQueryOptions = () =>
  queryOptions({ queryKey: dispatchKeys.list(), queryFn: ({ signal }) => getDispatches({ signal }) });
export const useDispatches = () => useQuery(getDispatchesQueryOptions());
