import type { PledgeState } from '@shared/schemas/campaign';
import { queryOptions, useQuery } from '@tanstack/react-query';
import type { RefundReason } from '@shared/schemas/books';
import { api } from '@/lib/api-client';
import { booksKeys } from './keys';

export type BooksPledge = {
  pledge: {
    id: string;
    state: PledgeState;
    amountMinor: number;
    currency: string;
    kind: string;
    campaignTitle: string;
    backer: { email: string; name: string | null } | null;
    paidAt: string | null;
  };
  charges: {
    chargeId: string;
    amountMinor: number;
    currency: string;
    refundableMinor: number;
    /** Demo data: written straight to the ledger, never made at the processor. */
    demo: boolean;
  }[];
  ledger: {
    id: number;
    kind: string;
    amountMinor: number;
    currency: string;
    processorObjectId: string;
    description: string;
    occurredAt: string;
    bookedMonth: string;
  }[];
  refunds: {
    id: string;
    amountMinor: number;
    currency: string;
    reason: RefundReason;
    note: string;
    chargeId: string;
    state: 'pending' | 'booked' | 'failed';
    failureMessage: string | null;
    createdAt: string;
  }[];
  receipts: { id: string; number: number; kind: string; amountMinor: number; currency: string; voided: boolean; issuedAt: string }[];
};
export const getPledge = (id: string, { signal }: { signal?: AbortSignal } = {}) =>
  api.get<BooksPledge>(`/api/books/pledges/${id}`, { signal });
export const getPledgeQueryOptions = (id: string) =>
  queryOptions({
    queryKey: booksKeys.pledge(id),
    queryFn: ({ signal }) => getPledge(id, { signal }),
    // A refund stays pending until the processor's webhook books it: look again every two seconds till then.
    refetchInterval: (q) => (q.state.data?.refunds.some((r) => r.state === 'pending') ? 2000 : false),
  });
export const usePledge = (id: string | null) => useQuery({ ...getPledgeQueryOptions(id ?? ''), enabled: Boolean(id) });
