import { queryOptions, useQuery } from '@tanstack/react-query';
import { api, withQuery } from '@/lib/api-client';
import type { Upload } from '../types';
import { orbitKeys } from './keys';

const stillWorking = (status: Upload['status'] | undefined) => status === 'parsing' || status === 'importing';

/** `after`: the version the page shows; the server then answers when the upload has moved on (or after ~25 s). */
export function getUpload({ jobId, after, signal }: { jobId: string; after?: string; signal?: AbortSignal }) {
  return api.get<{ upload: Upload }>(withQuery(`/api/orbit/uploads/${encodeURIComponent(jobId)}`, { after }), { signal });
}

/** Follows the upload while the server parses or imports it: each answer arrives when something changed. */
export function getUploadQueryOptions(jobId: string) {
  return queryOptions({
    queryKey: orbitKeys.upload(jobId),
    queryFn: ({ signal, client, queryKey }) => {
      const shown = client.getQueryData<{ upload: Upload }>(queryKey)?.upload;
      return getUpload({ jobId, after: stillWorking(shown?.status) ? shown?.version : undefined, signal });
    },
    // The request itself waits for the next change, so the next one can be asked for almost at once.
    refetchInterval: (query) => (stillWorking(query.state.data?.upload.status) ? 50 : false),
  });
}

export function useUpload(jobId: string | null) {
  return useQuery({ ...getUploadQueryOptions(jobId ?? ''), enabled: !!jobId });
}
