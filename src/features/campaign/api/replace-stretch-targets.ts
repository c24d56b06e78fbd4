import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { CampaignView, StretchTargetsInput } from '@shared/schemas/campaign';
import { api } from '@/lib/api-client';
import { campaignKeys } from './get-campaign';

export function replaceStretchTargets(slug: string, input: StretchTargetsInput) {
  return api.put<{ campaign: CampaignView }>(`/api/campaigns/${encodeURIComponent(slug)}/stretch-targets`, input).then((r) => r.campaign);
}

export function useReplaceStretchTargets(slug: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: StretchTargetsInput) => replaceStretchTargets(slug, input),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: campaignKeys.all }),
  });
}
