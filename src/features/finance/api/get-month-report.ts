import { queryOptions, useQuery } from '@tanstack/react-query';
import type { MonthReportView } from '@shared/schemas/books';
import { api } from '@/lib/api-client';
import { booksKeys } from './keys';

export const getMonthReport = (month: string, { signal }: { signal?: AbortSignal } = {}) =>
  api.get<MonthReportView>(`/api/books/months/${month}`, { signal });
export const getMonthReportQueryOptions = (month: string) =>
  queryOptions({ queryKey: booksKeys.month(month), queryFn: ({ signal }) => getMonthReport(month, { signal }) });
export const useMonthReport = (month: string) => useQuery(getMonthReportQueryOptions(month));
