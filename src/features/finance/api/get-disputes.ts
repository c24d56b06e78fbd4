import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { booksKeys } from './keys';

export type BooksDispute = {
  id: string;
  status: string;
  amountMinor: number;
  currency: string;
  reason: string;
  chargeId: string;
  pledgeId: string | null;
  respondBy: string | null;
  createdAt: string;
};
export const getDisputes = ({ signal }: { signal?: AbortSignal } = {}) =>
  api.get<{ disputes: BooksDispute[] }>('/api/books/disputes', { signal }).then((r) => r.disputes);
export const getDisputesQueryOptions = () =>
  queryOptions({ queryKey: booksKeys.disputes(), queryFn: ({ signal }) => getDisputes({ signal }) });
export const useDisputes = () => useQuery(getDisputesQueryOptions());
