import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import type { Upload } from '../types';
import { orbitKeys } from './keys';

export function finishUpload({ jobId, action }: { jobId: string; action: 'import' | 'cancel' }) {
  return api.post<{ upload: Upload }>(`/api/orbit/uploads/${encodeURIComponent(jobId)}/${action}`, {});
}

/** Import or cancel a previewed upload. */
export function useFinishUpload() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: finishUpload,
    onSuccess: ({ upload }) => queryClient.setQueryData(orbitKeys.upload(upload.id), { upload }),
  });
}
