import { queryOptions, useQuery } from '@tanstack/react-query';
import type { CampaignView } from '@shared/schemas/campaign';
import { api } from '@/lib/api-client';
import { campaignKeys } from './get-campaign';

/** Staff view: inactive tiers included, never cached on the server. */
export function getCampaignManage(slug: string, { signal }: { signal?: AbortSignal } = {}) {
  return api.get<{ campaign: CampaignView }>(`/api/campaigns/${encodeURIComponent(slug)}/manage`, { signal }).then((r) => r.campaign);
}

export function getCampaignManageQueryOptions(slug: string) {
  return queryOptions({ queryKey: campaignKeys.manage(slug), queryFn: ({ signal }) => getCampaignManage(slug, { signal }) });
}

export function useCampaignManage(slug: string) {
  return useQuery(getCampaignManageQueryOptions(slug));
}
