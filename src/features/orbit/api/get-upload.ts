import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import type { Upload } from '../types';
import { orbitKeys } from './keys';

export function getUpload({ jobId, signal }: { jobId: string; signal?: AbortSignal }) {
  return api.get<{ upload: Upload }>(`/api/orbit/uploads/${encodeURIComponent(jobId)}`, { signal });
}

/** Polls while the server is still parsing or importing. */
export function getUploadQueryOptions(jobId: string) {
  return queryOptions({
    queryKey: orbitKeys.upload(jobId),
    queryFn: ({ signal }) => getUpload({ jobId, signal }),
    refetchInterval: (query) => {
      const status = query.state.data?.upload.status;
      return status === 'parsing' || status === 'importing' ? 300 : false;
    },
  });
}

export function useUpload(jobId: string | null) {
  return useQuery({ ...getUploadQueryOptions(jobId ?? ''), enabled: !!jobId });
}
