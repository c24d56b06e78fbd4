import { queryOptions, useQuery, type QueryClient } from '@tanstack/react-query';
import type { AccountView } from '@shared/schemas/auth';
import { api } from '@/lib/api-client';

export const authKeys = {
  all: ['auth'] as const,
  me: () => [...authKeys.all, 'me'] as const,
  providers: () => [...authKeys.all, 'providers'] as const,
};

/** The signed-in account, or null when nobody is signed in. */
export async function getMe({ signal }: { signal?: AbortSignal } = {}): Promise<AccountView | null> {
  const { account } = await api.get<{ account: AccountView | null }>('/api/auth/me', { signal });
  return account;
}

export function getMeQueryOptions() {
  return queryOptions({
    queryKey: authKeys.me(),
    queryFn: ({ signal }) => getMe({ signal }),
    staleTime: 60_000,
  });
}

export function useMe() {
  return useQuery(getMeQueryOptions());
}

/** After sign-in or sign-up: anything cached belonged to whoever was signed in before. */
export function adoptSignedInAccount(queryClient: QueryClient, account: AccountView): void {
  queryClient.removeQueries({ predicate: (q) => q.queryKey[0] !== authKeys.all[0] });
  queryClient.setQueryData(getMeQueryOptions().queryKey, account);
}
