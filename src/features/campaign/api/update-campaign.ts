import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { CampaignView, UpdateCampaignInput } from '@shared/schemas/campaign';
import { api } from '@/lib/api-client';
import { campaignKeys } from './get-campaign';

export function updateCampaign(slug: string, input: UpdateCampaignInput) {
  return api.patch<{ campaign: CampaignView }>(`/api/campaigns/${encodeURIComponent(slug)}`, input).then((r) => r.campaign);
}

export function useUpdateCampaign(slug: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: UpdateCampaignInput) => updateCampaign(slug, input),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: campaignKeys.all }),
  });
}
