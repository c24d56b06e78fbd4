import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { ResolveFindingInput } from '@shared/schemas/books';
import { api } from '@/lib/api-client';
import { booksKeys } from './keys';

export const resolveFinding = ({ id, ...input }: ResolveFindingInput & { id: number }) =>
  api.post<{ ok: true }>(`/api/books/findings/${id}/resolve`, input);
export function useResolveFinding() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: resolveFinding, onSuccess: () => qc.invalidateQueries({ queryKey: booksKeys.all }) });
}
