import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { DispatchProgress } from '@shared/schemas/dispatch';
import { api } from '@/lib/api-client';
import { dispatchKeys } from './keys';

export function getProgress({ id, signal }: { id: string; signal?: AbortSignal }) {
  return api.get<{ progress: DispatchProgress }>(`/api/dispatches/${id}/progress`, { signal }).then((r) => r.progress);
}
/** Polls while mail is going out; stops once every message is sent or failed. */
export function useProgress(id: string, enabled: boolean) {
  return useQuery({
    queryKey: dispatchKeys.progress(id),
    queryFn: ({ signal }) => getProgress({ id, signal }),
    enabled,
    refetchInterval: (q) => (q.state.data && (q.state.data.state === 'done' || q.state.data.state === 'none') ? false : 1000),
  });
}
export function useRetryFailed(id: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (mailIds?: Array<string | number>) => api.post<{ retried: number }>(`/api/dispatches/${id}/retry`, { mailIds }),
    onSuccess: () => qc.invalidateQueries({ queryKey: dispatchKeys.progress(id) }),
  });
}
export function useEmailDispatch(id: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: () => api.post(`/api/dispatches/${id}/email`, {}),
    onSuccess: () => qc.invalidateQueries({ queryKey: dispatchKeys.all }),
  });
}
