import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { getMeQueryOptions } from './get-me';

export function signOut(): Promise<void> {
  return api.post<void>('/api/auth/sign-out', undefined, { rotatesSession: true });
}

export function useSignOut({ onSuccess }: { onSuccess?: () => void } = {}) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: signOut,
    onSuccess: () => {
      queryClient.clear();
      queryClient.setQueryData(getMeQueryOptions().queryKey, null);
      onSuccess?.();
    },
  });
}
