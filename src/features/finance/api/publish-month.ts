import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { booksKeys } from './keys';

export const publishMonth = ({ month, campaignSlug }: { month: string; campaignSlug: string }) =>
  api.post<{ account: unknown }>(`/api/books/months/${month}/publish`, { campaignSlug });
export function usePublishMonth() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: publishMonth, onSuccess: () => qc.invalidateQueries({ queryKey: booksKeys.months() }) });
}
