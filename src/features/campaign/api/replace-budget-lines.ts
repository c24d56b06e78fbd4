import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { CampaignView } from '@shared/schemas/campaign';
import type { BudgetLinesInput } from '@shared/schemas/budget-lines';
import { api } from '@/lib/api-client';
import { campaignKeys } from './get-campaign';

export function replaceBudgetLines(slug: string, input: BudgetLinesInput) {
  return api.put<{ campaign: CampaignView }>(`/api/campaigns/${encodeURIComponent(slug)}/budget-lines`, input).then((r) => r.campaign);
}

export function useReplaceBudgetLines(slug: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: BudgetLinesInput) => replaceBudgetLines(slug, input),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: campaignKeys.all }),
  });
}
