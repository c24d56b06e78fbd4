import { useMutation } from '@tanstack/react-query';
import { signUpSchema, type AccountView } from '@shared/schemas/auth';
import type { z } from 'zod';
import { api } from '@/lib/api-client';

// shared/ has no account-update schema yet; the display-name rule is the sign-up one.
export const updateAccountInputSchema = signUpSchema.pick({ displayName: true });
export type UpdateAccountInput = z.infer<typeof updateAccountInputSchema>;

export function updateAccount(input: UpdateAccountInput): Promise<{ account: AccountView }> {
  return api.patch<{ account: AccountView }>('/api/account', input);
}

/** The caller owns the signed-in account's cache, so it decides what to do with the new view. */
export function useUpdateAccount({ onSuccess }: { onSuccess?: (account: AccountView) => void } = {}) {
  return useMutation({
    mutationFn: updateAccount,
    onSuccess: ({ account }) => onSuccess?.(account),
  });
}
