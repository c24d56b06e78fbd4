import { useMutation } from '@tanstack/react-query';
import type { z } from 'zod';
import type { resetPasswordSchema } from '@shared/schemas/auth';
import { api } from '@/lib/api-client';

export type ResetPasswordInput = z.infer<typeof resetPasswordSchema>;

export function resetPassword(input: ResetPasswordInput): Promise<void> {
  return api.post<void>('/api/auth/reset-password', input);
}

export function useResetPassword() {
  return useMutation({ mutationFn: resetPassword });
}
