import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { MembershipView } from '@shared/schemas/campaign';
import { api } from '@/lib/api-client';
import { mySupportKeys } from './get-my-pledges';

/** `cancel`: stop at the end of the current period; `resume`: keep renewing. */
export function setMembershipRenewal(id: string, action: 'cancel' | 'resume') {
  return api
    .post<{ membership: MembershipView }>(`/api/my-support/memberships/${encodeURIComponent(id)}/${action}`)
    .then((r) => r.membership);
}

export function useSetMembershipRenewal() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ id, action }: { id: string; action: 'cancel' | 'resume' }) => setMembershipRenewal(id, action),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: mySupportKeys.memberships() }),
  });
}
