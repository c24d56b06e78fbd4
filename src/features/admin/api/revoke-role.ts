import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { AccountView, Role } from '@shared/schemas/auth';
import { api } from '@/lib/api-client';
import { invalidateAfterRoleChange } from './keys';

export function revokeRole({ accountId, role }: { accountId: string; role: Role }): Promise<{ account: AccountView }> {
  return api.delete<{ account: AccountView }>(`/api/admin/accounts/${encodeURIComponent(accountId)}/roles/${encodeURIComponent(role)}`);
}

export function useRevokeRole({ onSuccess }: { onSuccess?: (account: AccountView) => void } = {}) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: revokeRole,
    onSuccess: async ({ account }) => {
      await invalidateAfterRoleChange(queryClient);
      onSuccess?.(account);
    },
  });
}
