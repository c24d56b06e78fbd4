import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { booksKeys } from './keys';

export type BooksDashboard = {
  months: { month: string; currency: string; chargesMinor: number; feesMinor: number; refundsMinor: number; netMinor: number }[];
  pledgesByDay: { day: string; count: number; amountMinor: number; currency: string }[];
  byTier: { tier: string; currency: string; count: number; amountMinor: number }[];
  monthlyRecurring: { currency: string; amountMinor: number; members: number }[];
  churn: { endedLast30Days: number; atStart: number; rate: number };
  failedRenewalsAwaitingRetry: number;
};

export const getDashboard = ({ signal }: { signal?: AbortSignal } = {}) => api.get<BooksDashboard>('/api/books/dashboard', { signal });
export const getDashboardQueryOptions = () =>
  queryOptions({ queryKey: booksKeys.dashboard(), queryFn: ({ signal }) => getDashboard({ signal }) });
export const useDashboard = () => useQuery(getDashboardQueryOptions());
