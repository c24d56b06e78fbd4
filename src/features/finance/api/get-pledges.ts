import type { PledgeState } from '@shared/schemas/campaign';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api, withQuery } from '@/lib/api-client';
import { booksKeys } from './keys';

export type BooksPledgeRow = {
  id: string;
  state: PledgeState;
  amountMinor: number;
  currency: string;
  campaignTitle: string;
  backer: { email: string; name: string | null } | null;
};
export const getPledges = (q: string, { signal }: { signal?: AbortSignal } = {}) =>
  api.get<{ pledges: BooksPledgeRow[] }>(withQuery('/api/books/pledges', { q }), { signal }).then((r) => r.pledges);
export const getPledgesQueryOptions = (q: string) =>
  queryOptions({ queryKey: booksKeys.pledges(q), queryFn: ({ signal }) => getPledges(q, { signal }) });
export const usePledges = (q: string) => useQuery(getPledgesQueryOptions(q));
