import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { PledgeView } from '@shared/schemas/campaign';
import { api } from '@/lib/api-client';
import { pledgeKeys } from './get-pledge';

export function cancelPledge(id: string) {
  return api.post<{ pledge: PledgeView }>(`/api/pledges/${encodeURIComponent(id)}/cancel`).then((r) => r.pledge);
}

export function useCancelPledge() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: cancelPledge,
    onSuccess: (pledge) => queryClient.setQueryData(pledgeKeys.detail(pledge.id), pledge),
  });
}
