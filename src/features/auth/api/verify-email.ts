import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import type { AccountView, verifyEmailSchema } from '@shared/schemas/auth';
import { api } from '@/lib/api-client';
import { adoptSignedInAccount } from './get-me';

export type VerifyEmailInput = z.infer<typeof verifyEmailSchema>;

/** The confirmation link: confirms the address and signs its account in (a new session). */
export function verifyEmail(input: VerifyEmailInput): Promise<{ account: AccountView }> {
  return api.post<{ account: AccountView }>('/api/auth/verify-email', input, { rotatesSession: true });
}

export function useVerifyEmail() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: verifyEmail,
    onSuccess: ({ account }) => adoptSignedInAccount(queryClient, account),
  });
}
