import { useMutation } from '@tanstack/react-query';
import type { SignUpInput } from '@shared/schemas/auth';
import { api } from '@/lib/api-client';

export type SignUpAnswer = { status: string; message: string };

/**
 * Sign-up answers the same for a new address and a known one (no account enumeration), and signs nobody in: a new
 * account signs in through the link in its confirmation mail. The caller shows the answer ("check your inbox").
 */
export function signUp(input: SignUpInput): Promise<SignUpAnswer> {
  return api.post<SignUpAnswer>('/api/auth/sign-up', input);
}

export function useSignUp() {
  return useMutation({ mutationFn: signUp });
}
