import { useMutation } from '@tanstack/react-query';
import { api } from '@/lib/api-client';

/** A one-time link to the processor's card page for this membership. */
export function openCardUpdate(id: string) {
  return api.post<{ url: string }>(`/api/my-support/memberships/${encodeURIComponent(id)}/card`).then((r) => r.url);
}

export function useOpenCardUpdate() {
  return useMutation({ mutationFn: openCardUpdate });
}
