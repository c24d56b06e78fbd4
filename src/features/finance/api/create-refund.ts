import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import type { createRefundSchema } from '@shared/schemas/books';
import { api } from '@/lib/api-client';
import { booksKeys } from './keys';

export const createRefund = ({ pledgeId, ...input }: z.input<typeof createRefundSchema> & { pledgeId: string }) =>
  api.post<{ refund: { id: string; status: string } }>(`/api/books/pledges/${pledgeId}/refunds`, input);
export function useCreateRefund() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: createRefund, onSuccess: () => qc.invalidateQueries({ queryKey: booksKeys.all }) });
}
