import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { StartReconciliationInput } from '@shared/schemas/books';
import { api } from '@/lib/api-client';
import { booksKeys } from './keys';
import type { Finding, ReconRun } from './get-reconciliations';

export const startReconciliation = (input: StartReconciliationInput) =>
  api.post<{ run: ReconRun; findings: Finding[] }>('/api/books/reconciliations', input);
export function useStartReconciliation() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: startReconciliation,
    // The run is queued (202); its page polls the stored progress.
    onSuccess: (r) => {
      qc.setQueryData(booksKeys.run(r.run.id), r);
      return qc.invalidateQueries({ queryKey: booksKeys.runs() });
    },
  });
}
