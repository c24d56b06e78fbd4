import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { DispatchDetail, SaveDispatchInput, TransitionDispatch } from '@shared/schemas/dispatch';
import { api } from '@/lib/api-client';
import { dispatchKeys } from './keys';

export function saveDispatch(id: string | null, input: SaveDispatchInput) {
  return (
    id
      ? api.put<{ dispatch: DispatchDetail }>(`/api/dispatches/${id}`, input)
      : api.post<{ dispatch: DispatchDetail }>('/api/dispatches', input)
  ).then((r) => r.dispatch);
}
export function useSaveDispatch(id: string | null) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (input: SaveDispatchInput) => saveDispatch(id, input),
    onSuccess: () => qc.invalidateQueries({ queryKey: dispatchKeys.all }),
  });
}

export function transitionDispatch(id: string, body: TransitionDispatch) {
  return api.post<{ dispatch: DispatchDetail }>(`/api/dispatches/${id}/transition`, body).then((r) => r.dispatch);
}
export function useTransitionDispatch(id: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (b: TransitionDispatch) => transitionDispatch(id, b),
    onSuccess: () => qc.invalidateQueries({ queryKey: dispatchKeys.all }),
  });
}

export function previewMarkdown(markdown: string, signal?: AbortSignal) {
  return api.post<{ html: string; excerpt: string }>('/api/dispatches/preview', { markdown }, { signal });
}
