import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { MailQueueEntry } from '@shared/schemas/mail-queue';
import { api } from '@/lib/api-client';
import { adminKeys } from './keys';

export function retryMail({ id }: { id: string }): Promise<{ entry: MailQueueEntry }> {
  return api.post<{ entry: MailQueueEntry }>(`/api/admin/mail-queue/${encodeURIComponent(id)}/retry`, {});
}

export function useRetryMail() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: retryMail,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: adminKeys.mailQueue() }),
  });
}
