import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { AccountView } from '@shared/schemas/auth';
import { api, withQuery } from '@/lib/api-client';
import { adminKeys } from './keys';

export function getAccounts({ q, signal }: { q: string; signal?: AbortSignal }): Promise<{ accounts: AccountView[] }> {
  return api.get<{ accounts: AccountView[] }>(withQuery('/api/admin/accounts', { q: q.trim() }), { signal });
}

export function getAccountsQueryOptions({ q }: { q: string }) {
  return queryOptions({
    queryKey: adminKeys.accountList(q.trim()),
    queryFn: ({ signal }) => getAccounts({ q, signal }),
    placeholderData: keepPreviousData,
  });
}

export function useAccounts({ q }: { q: string }) {
  return useQuery(getAccountsQueryOptions({ q }));
}
