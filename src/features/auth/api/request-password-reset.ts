import { useMutation } from '@tanstack/react-query';
import type { z } from 'zod';
import type { requestPasswordResetSchema } from '@shared/schemas/auth';
import { api } from '@/lib/api-client';

export type RequestPasswordResetInput = z.infer<typeof requestPasswordResetSchema>;

export function requestPasswordReset(input: RequestPasswordResetInput): Promise<void> {
  return api.post<void>('/api/auth/request-password-reset', input);
}

export function useRequestPasswordReset() {
  return useMutation({ mutationFn: requestPasswordReset });
}
