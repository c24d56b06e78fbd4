import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import type { verifyEmailSchema } from '@shared/schemas/auth';
import { api } from '@/lib/api-client';
import { getMeQueryOptions } from './get-me';

export type VerifyEmailInput = z.infer<typeof verifyEmailSchema>;

export function verifyEmail(input: VerifyEmailInput): Promise<void> {
  return api.post<void>('/api/auth/verify-email', input);
}

export function useVerifyEmail() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: verifyEmail,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: getMeQueryOptions().queryKey }),
  });
}
