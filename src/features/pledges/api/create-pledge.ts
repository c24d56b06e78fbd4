import { useMutation } from '@tanstack/react-query';
import type { CreatePledgeInput, PledgeView } from '@shared/schemas/campaign';
import { api } from '@/lib/api-client';

export function createPledge(input: CreatePledgeInput) {
  return api.post<{ pledge: PledgeView; checkoutUrl: string }>('/api/pledges', input);
}

export function useCreatePledge() {
  return useMutation({ mutationFn: createPledge });
}
