import { queryOptions, useQuery } from '@tanstack/react-query';
import type { CampaignView } from '@shared/schemas/campaign';
import { api } from '@/lib/api-client';

export const campaignKeys = {
  all: ['campaigns'] as const,
  list: () => [...campaignKeys.all, 'list'] as const,
  detail: (slug: string) => [...campaignKeys.all, 'detail', slug] as const,
  backers: (slug: string) => [...campaignKeys.all, 'detail', slug, 'backers'] as const,
  manage: (slug: string) => [...campaignKeys.all, 'manage', slug] as const,
};

/** The campaign Lightkeel features when no slug is given. */
export const FEATURED_CAMPAIGN = 'tern-1';

export function getCampaign(slug: string, { signal }: { signal?: AbortSignal } = {}) {
  return api.get<{ campaign: CampaignView }>(`/api/campaigns/${encodeURIComponent(slug)}`, { signal }).then((r) => r.campaign);
}

export function getCampaignQueryOptions(slug: string) {
  return queryOptions({
    queryKey: campaignKeys.detail(slug),
    queryFn: ({ signal }) => getCampaign(slug, { signal }),
    staleTime: 5_000,
    // Progress moves as pledges land; a page left open keeps up.
    refetchInterval: 30_000,
  });
}

export function useCampaign(slug: string) {
  return useQuery(getCampaignQueryOptions(slug));
}
