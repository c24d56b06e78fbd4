import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { booksKeys } from './keys';

export type BooksPledge = {
  pledge: {
    id: string;
    state: string;
    amountMinor: number;
    currency: string;
    campaignTitle: string;
    backer: { email: string; name: string | null } | null;
  };
  charges: { chargeId: string; amountMinor: number; currency: string; refundableMinor: number }[];
  ledger: {
    id: number;
    kind: string;
    amountMinor: number;
    currency: string;
    description: string;
    occurredAt: string;
    bookedMonth: string;
  }[];
  refunds: {
    id: string;
    amountMinor: number;
    currency: string;
    reason: string;
    state: 'pending' | 'booked' | 'failed';
    createdAt: string;
  }[];
  receipts: { id: string; number: number; kind: string; amountMinor: number; currency: string; voided: boolean }[];
};
export const getPledge = (id: string, { signal }: { signal?: AbortSignal } = {}) =>
  api.get<BooksPledge>(`/api/books/pledges/${id}`, { signal });
export const getPledgeQueryOptions = (id: string) =>
  queryOptions({ queryKey: booksKeys.pledge(id), queryFn: ({ signal }) => getPledge(id, { signal }) });
export const usePledge = (id: string | null) => useQuery({ ...getPledgeQueryOptions(id ?? ''), enabled: Boolean(id) });
