import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { authKeys } from './get-me';

export type SignInProviders = { google: boolean };

export function getProviders({ signal }: { signal?: AbortSignal } = {}): Promise<SignInProviders> {
  return api.get<SignInProviders>('/api/auth/providers', { signal });
}

export function getProvidersQueryOptions() {
  return queryOptions({
    queryKey: authKeys.providers(),
    queryFn: ({ signal }) => getProviders({ signal }),
    staleTime: 5 * 60_000,
  });
}

export function useProviders() {
  return useQuery(getProvidersQueryOptions());
}
