import { queryOptions, useQuery } from '@tanstack/react-query';
import type { MembershipView } from '@shared/schemas/campaign';
import { api } from '@/lib/api-client';
import { mySupportKeys } from './get-my-pledges';

export function getMemberships({ signal }: { signal?: AbortSignal } = {}) {
  return api.get<{ memberships: MembershipView[] }>('/api/my-support/memberships', { signal }).then((r) => r.memberships);
}

export function getMembershipsQueryOptions() {
  return queryOptions({ queryKey: mySupportKeys.memberships(), queryFn: ({ signal }) => getMemberships({ signal }), staleTime: 5_000 });
}

export function useMemberships() {
  return useQuery(getMembershipsQueryOptions());
}
