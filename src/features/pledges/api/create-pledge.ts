import { useMutation } from '@tanstack/react-query';
import type { CreatePledgeInput, PledgeView } from '@shared/schemas/campaign';
import { api } from '@/lib/api-client';
import { getPledge } from './get-pledge';

const LINK_POLL_MS = 1000;
const LINK_POLLS = 30;

export async function createPledge(input: CreatePledgeInput): Promise<{ pledge: PledgeView; checkoutUrl: string }> {
  const res = await api.post<{ pledge: PledgeView; checkoutUrl: string | null }>('/api/pledges', input);
  if (res.checkoutUrl) return { pledge: res.pledge, checkoutUrl: res.checkoutUrl };
  // 202: an earlier submit of this attempt is still opening the checkout; its link appears on the pledge.
  for (let i = 0; i < LINK_POLLS; i++) {
    await new Promise((r) => setTimeout(r, LINK_POLL_MS));
    const pledge = await getPledge(res.pledge.id);
    if (pledge.checkoutUrl) return { pledge, checkoutUrl: pledge.checkoutUrl };
    if (pledge.state !== 'started') break;
  }
  throw new Error('The checkout could not be opened. Your pledge is listed in My support; try it from there.');
}

export function useCreatePledge() {
  return useMutation({ mutationFn: createPledge });
}
