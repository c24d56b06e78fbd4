import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { campaignKeys } from './get-campaign';

/** A closed month's account as finance published it: totals only, no personal data. */
export type MonthlyAccountView = {
  month: string;
  currency: string;
  raisedMinor: number;
  feesMinor: number;
  refundsMinor: number;
  disputesMinor: number;
  netMinor: number;
  backerCount: number;
  publishedAt: string;
};

export function getMonthlyAccounts(slug: string, { signal }: { signal?: AbortSignal } = {}) {
  return api
    .get<{ accounts: MonthlyAccountView[] }>(`/api/public/monthly-accounts/${encodeURIComponent(slug)}`, { signal })
    .then((r) => r.accounts);
}

export function useMonthlyAccounts(slug: string) {
  return useQuery(
    queryOptions({
      queryKey: [...campaignKeys.detail(slug), 'monthly-accounts'] as const,
      queryFn: ({ signal }) => getMonthlyAccounts(slug, { signal }),
      staleTime: 60_000,
    }),
  );
}
