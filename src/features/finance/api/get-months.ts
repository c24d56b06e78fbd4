import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { booksKeys } from './keys';

export type BooksMonth = { month: string; closedAt: string | null; published: boolean };
export const getMonths = ({ signal }: { signal?: AbortSignal } = {}) =>
  api.get<{ months: BooksMonth[] }>('/api/books/months', { signal }).then((r) => r.months);
export const getMonthsQueryOptions = () => queryOptions({ queryKey: booksKeys.months(), queryFn: ({ signal }) => getMonths({ signal }) });
export const useMonths = () => useQuery(getMonthsQueryOptions());
