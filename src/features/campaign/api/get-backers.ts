import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { campaignKeys } from './get-campaign';

export type BackerView = {
  id: string;
  name: string | null;
  message: string | null;
  tier: string | null;
  kind: 'one-time' | 'monthly';
  paidAt: string | null;
};

export function getBackers(slug: string, { signal }: { signal?: AbortSignal } = {}) {
  return api
    .get<{ backers: BackerView[] }>(`/api/campaigns/${encodeURIComponent(slug)}/backers?limit=100`, { signal })
    .then((r) => r.backers);
}

export function getBackersQueryOptions(slug: string) {
  return queryOptions({ queryKey: campaignKeys.backers(slug), queryFn: ({ signal }) => getBackers(slug, { signal }), staleTime: 15_000 });
}

export function useBackers(slug: string) {
  return useQuery(getBackersQueryOptions(slug));
}
