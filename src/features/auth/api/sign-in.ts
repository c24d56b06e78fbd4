import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { AccountView, SignInInput } from '@shared/schemas/auth';
import { api } from '@/lib/api-client';
import { adoptSignedInAccount } from './get-me';

export function signIn(input: SignInInput): Promise<{ account: AccountView }> {
  return api.post<{ account: AccountView }>('/api/auth/sign-in', input, { rotatesSession: true });
}

export function useSignIn({ onSuccess }: { onSuccess?: (account: AccountView) => void } = {}) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: signIn,
    onSuccess: ({ account }) => {
      adoptSignedInAccount(queryClient, account);
      onSuccess?.(account);
    },
  });
}
