import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { AccountView, SignUpInput } from '@shared/schemas/auth';
import { api } from '@/lib/api-client';
import { adoptSignedInAccount } from './get-me';

export function signUp(input: SignUpInput): Promise<{ account: AccountView }> {
  return api.post<{ account: AccountView }>('/api/auth/sign-up', input, { rotatesSession: true });
}

export function useSignUp({ onSuccess }: { onSuccess?: (account: AccountView) => void } = {}) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: signUp,
    onSuccess: ({ account }) => {
      adoptSignedInAccount(queryClient, account);
      onSuccess?.(account);
    },
  });
}
