import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { PledgeView, RetryPledgeInput } from '@shared/schemas/campaign';
import { api } from '@/lib/api-client';
import { mySupportKeys } from './get-my-pledges';

const LINK_POLL_MS = 1000;
const LINK_POLLS = 30;

/** "Try again": a fresh attempt for the same gift and amount; answers the new checkout link to go to. */
export async function retryPledge({ pledgeId, ...input }: RetryPledgeInput & { pledgeId: string }) {
  const res = await api.post<{ pledge: PledgeView; checkoutUrl: string | null }>(
    `/api/pledges/${encodeURIComponent(pledgeId)}/again`,
    input,
  );
  if (res.checkoutUrl) return { pledge: res.pledge, checkoutUrl: res.checkoutUrl };
  // 202: an earlier click of this attempt is still opening the checkout; its link appears on the new pledge.
  for (let i = 0; i < LINK_POLLS; i++) {
    await new Promise((r) => setTimeout(r, LINK_POLL_MS));
    const { pledge } = await api.get<{ pledge: PledgeView }>(`/api/pledges/${encodeURIComponent(res.pledge.id)}`);
    if (pledge.checkoutUrl) return { pledge, checkoutUrl: pledge.checkoutUrl };
    if (pledge.state !== 'started') break;
  }
  throw new Error('The checkout could not be opened. The new attempt is listed below; try it from there.');
}

export function useRetryPledge() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: retryPledge,
    onSettled: () => queryClient.invalidateQueries({ queryKey: mySupportKeys.pledges() }),
  });
}
