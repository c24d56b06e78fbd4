import { queryOptions, useQuery } from '@tanstack/react-query';
import type { DispatchDetail } from '@shared/schemas/dispatch';
import { api } from '@/lib/api-client';
import { dispatchKeys } from './keys';

export function getDispatch({ id, signal }: { id: string; signal?: AbortSignal }) {
  return api.get<{ dispatch: DispatchDetail; heroLimits: { maxBytes: number } }>(`/api/dispatches/${encodeURIComponent(id)}`, { signal });
}
export const getDispatchQueryOptions = (id: string) =>
  queryOptions({ queryKey: dispatchKeys.one(id), queryFn: ({ signal }) => getDispatch({ id, signal }) });
export const useDispatch = (id: string) => useQuery({ ...getDispatchQueryOptions(id), enabled: id !== 'new' });
