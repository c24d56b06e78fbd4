import type { QueryClient } from '@tanstack/react-query';

export const adminKeys = {
  all: ['admin'] as const,
  accounts: () => [...adminKeys.all, 'accounts'] as const,
  accountList: (q: string) => [...adminKeys.accounts(), { q }] as const,
  audit: () => [...adminKeys.all, 'audit'] as const,
  auditList: (limit: number) => [...adminKeys.audit(), { limit }] as const,
  mailQueue: () => [...adminKeys.all, 'mail-queue'] as const,
  mailQueueList: (filter: { state?: string; page: number }) => [...adminKeys.mailQueue(), filter] as const,
};

/** A role change shows in the account list and adds an audit entry. */
export function invalidateAfterRoleChange(queryClient: QueryClient): Promise<unknown> {
  return Promise.all([
    queryClient.invalidateQueries({ queryKey: adminKeys.accounts() }),
    queryClient.invalidateQueries({ queryKey: adminKeys.audit() }),
  ]);
}
