import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { AccountView, Role } from '@shared/schemas/auth';
import { api } from '@/lib/api-client';
import { invalidateAfterRoleChange } from './keys';

export function grantRole({ accountId, role }: { accountId: string; role: Role }): Promise<{ account: AccountView }> {
  return api.post<{ account: AccountView }>(`/api/admin/accounts/${encodeURIComponent(accountId)}/roles`, { role });
}

export function useGrantRole({ onSuccess }: { onSuccess?: (account: AccountView) => void } = {}) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: grantRole,
    onSuccess: async ({ account }) => {
      await invalidateAfterRoleChange(queryClient);
      onSuccess?.(account);
    },
  });
}
