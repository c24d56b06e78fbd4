import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { booksKeys } from './keys';

export const closeMonth = (month: string) => api.post<{ month: string; closedAt: string }>(`/api/books/months/${month}/close`);
export function useCloseMonth() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: closeMonth, onSuccess: () => qc.invalidateQueries({ queryKey: booksKeys.months() }) });
}
