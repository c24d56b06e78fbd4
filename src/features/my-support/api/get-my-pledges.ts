import { queryOptions, useQuery } from '@tanstack/react-query';
import type { PaymentView, PledgeView } from '@shared/schemas/campaign';
import { api } from '@/lib/api-client';

export type MyPledge = PledgeView & { payments: PaymentView[] };

export const mySupportKeys = {
  all: ['my-support'] as const,
  pledges: () => [...mySupportKeys.all, 'pledges'] as const,
  memberships: () => [...mySupportKeys.all, 'memberships'] as const,
  receipt: (entryId: number) => [...mySupportKeys.all, 'receipts', entryId] as const,
  emailPreferences: () => [...mySupportKeys.all, 'email-preferences'] as const,
  places: () => [...mySupportKeys.all, 'places'] as const,
};

export function getMyPledges({ signal }: { signal?: AbortSignal } = {}) {
  return api.get<{ pledges: MyPledge[] }>('/api/my-support/pledges', { signal }).then((r) => r.pledges);
}

export function getMyPledgesQueryOptions() {
  return queryOptions({ queryKey: mySupportKeys.pledges(), queryFn: ({ signal }) => getMyPledges({ signal }), staleTime: 5_000 });
}

export function useMyPledges() {
  return useQuery(getMyPledgesQueryOptions());
}
