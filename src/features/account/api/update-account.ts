import { useMutation } from '@tanstack/react-query';
import { updateAccountSchema, type AccountView, type UpdateAccountInput } from '@shared/schemas/auth';
import { api } from '@/lib/api-client';

// The same schema validates on the server (PATCH /api/account).
export const updateAccountInputSchema = updateAccountSchema;
export type { UpdateAccountInput };

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
