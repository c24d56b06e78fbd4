import { api, ApiError } from '@/lib/api-client';
import type { Upload } from '../types';

/**
 * Sends a file (or pasted text) as multipart form data. XMLHttpRequest rather than fetch, because only it
 * reports upload progress.
 */
export async function startUpload({
  spacecraftId,
  file,
  text,
  onProgress,
  signal,
}: {
  spacecraftId: string;
  file?: File;
  text?: string;
  onProgress?: (sentBytes: number, totalBytes: number) => void;
  signal?: AbortSignal;
}): Promise<{ upload: Upload }> {
  const { csrfToken } = await api.get<{ csrfToken: string }>('/api/auth/csrf');
  const form = new FormData();
  if (file) form.append('file', file, file.name);
  else form.append('text', text ?? '');
  return new Promise((resolve, reject) => {
    const xhr = new XMLHttpRequest();
    xhr.open('POST', `/api/orbit/spacecraft/${encodeURIComponent(spacecraftId)}/uploads`);
    xhr.setRequestHeader('x-csrf-token', csrfToken);
    xhr.setRequestHeader('accept', 'application/json');
    xhr.responseType = 'json';
    xhr.upload.onprogress = (e) => {
      if (e.lengthComputable) onProgress?.(e.loaded, e.total);
    };
    xhr.onload = () => {
      const body = xhr.response as { upload?: Upload; error?: { code: string; message: string } } | null;
      if (xhr.status >= 200 && xhr.status < 300 && body?.upload) resolve({ upload: body.upload });
      else
        reject(
          new ApiError({
            status: xhr.status,
            code: body?.error?.code ?? `http.${xhr.status}`,
            message: body?.error?.message ?? `The upload failed (${xhr.status}).`,
          }),
        );
    };
    xhr.onerror = () =>
      reject(
        new ApiError({
          status: 0,
          code: 'network.unreachable',
          message: 'Could not reach Lightkeel. Check your connection and try again.',
        }),
      );
    signal?.addEventListener('abort', () => xhr.abort());
    xhr.send(form);
  });
}
