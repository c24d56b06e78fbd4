import { useMutation } from '@tanstack/react-query';
import { api } from '@/lib/api-client';

export function resendVerification(): Promise<void> {
  return api.post<void>('/api/auth/resend-verification');
}

export function useResendVerification() {
  return useMutation({ mutationFn: resendVerification });
}
