import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { AccountView, SignUpInput } from '@shared/schemas/auth';
import { api, ApiError } from '@/lib/api-client';
import { adoptSignedInAccount } from './get-me';
import { signIn } from './sign-in';

export type SignUpResult = { account: AccountView } | { account: null; message: string };

/**
 * Sign-up answers the same for a new address and a known one (no account enumeration), so it does not sign in.
 * The new account's owner knows the password, so the same credentials sign in at once; when they do not
 * (the address already had an account with another password), the answer is "check your inbox".
 */
export async function signUp(input: SignUpInput): Promise<SignUpResult> {
  const answer = await api.post<{ status: string; message: string }>('/api/auth/sign-up', input);
  try {
    return await signIn({ email: input.email, password: input.password });
  } catch (error) {
    if (error instanceof ApiError && error.status === 401) return { account: null, message: answer.message };
    throw error;
  }
}

export function useSignUp({ onSuccess }: { onSuccess?: (account: AccountView) => void } = {}) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: signUp,
    onSuccess: (result) => {
      if (!result.account) return;
      adoptSignedInAccount(queryClient, result.account);
      onSuccess?.(result.account);
    },
  });
}
