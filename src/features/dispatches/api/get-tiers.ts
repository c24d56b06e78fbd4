import { useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { dispatchKeys } from './keys';

type CampaignList = { campaigns: Array<{ slug: string }> };
type CampaignTiers = { campaign: { tiers: Array<{ id: string; title: string }> } };

/** Every tier of every campaign, for the audience picker. */
export const useCampaignTiers = () =>
  useQuery({
    queryKey: [...dispatchKeys.all, 'tiers'],
    queryFn: async ({ signal }) => {
      const list = await api.get<CampaignList>('/api/campaigns', { signal });
      const all = await Promise.all(list.campaigns.map((c) => api.get<CampaignTiers>(`/api/campaigns/${c.slug}`, { signal })));
      return all.flatMap((c) => c.campaign.tiers);
    },
  });
