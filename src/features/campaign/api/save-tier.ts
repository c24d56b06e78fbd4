import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { TierInput, TierView } from '@shared/schemas/campaign';
import { api } from '@/lib/api-client';
import { campaignKeys } from './get-campaign';

/** Creates a tier (no id) or replaces an existing one's fields. */
export function saveTier(slug: string, input: TierInput, tierId?: string) {
  const base = `/api/campaigns/${encodeURIComponent(slug)}/tiers`;
  const call = tierId ? api.patch<{ tier: TierView }>(`${base}/${tierId}`, input) : api.post<{ tier: TierView }>(base, input);
  return call.then((r) => r.tier);
}

export function useSaveTier(slug: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ input, tierId }: { input: TierInput; tierId?: string }) => saveTier(slug, input, tierId),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: campaignKeys.all }),
  });
}
