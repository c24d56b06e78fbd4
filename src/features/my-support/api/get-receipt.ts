import { queryOptions, useQuery } from '@tanstack/react-query';
import type { ReceiptView } from '@shared/schemas/campaign';
import { api } from '@/lib/api-client';
import { mySupportKeys } from './get-my-pledges';

export function getReceipt(entryId: number, { signal }: { signal?: AbortSignal } = {}) {
  return api.get<{ receipt: ReceiptView }>(`/api/my-support/receipts/${entryId}`, { signal }).then((r) => r.receipt);
}

export function getReceiptQueryOptions(entryId: number) {
  return queryOptions({
    queryKey: mySupportKeys.receipt(entryId),
    queryFn: ({ signal }) => getReceipt(entryId, { signal }),
    staleTime: Infinity,
  });
}

export function useReceipt(entryId: number) {
  return useQuery(getReceiptQueryOptions(entryId));
}
