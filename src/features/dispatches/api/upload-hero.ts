import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { DispatchDetail } from '@shared/schemas/dispatch';
import { api } from '@/lib/api-client';
import { dispatchKeys } from './keys';

/** Sends the hero image and its description in one multipart request; the server sniffs and measures the bytes. */
export function uploadHero({ id, file, alt }: { id: string; file: File; alt: string }) {
  const form = new FormData();
  form.append('alt', alt);
  form.append('file', file);
  return api.post<{ dispatch: DispatchDetail }>(`/api/dispatches/${encodeURIComponent(id)}/hero`, form).then((r) => r.dispatch);
}
export function useUploadHero(id: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (input: { file: File; alt: string }) => uploadHero({ id, ...input }),
    onSuccess: () => qc.invalidateQueries({ queryKey: dispatchKeys.all }),
  });
}

export function removeHero(id: string) {
  return api.delete<{ dispatch: DispatchDetail }>(`/api/dispatches/${encodeURIComponent(id)}/hero`).then((r) => r.dispatch);
}
export function useRemoveHero(id: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: () => removeHero(id),
    onSuccess: () => qc.invalidateQueries({ queryKey: dispatchKeys.all }),
  });
}
