import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { MailQueuePage, MailState } from '@shared/schemas/mail-queue';
import { api, withQuery } from '@/lib/api-client';
import { adminKeys } from './keys';

export type MailQueueFilter = { state?: MailState; page: number };

export function getMailQueue({ state, page, signal }: MailQueueFilter & { signal?: AbortSignal }): Promise<MailQueuePage> {
  return api.get<MailQueuePage>(withQuery('/api/admin/mail-queue', { state, page, pageSize: 25 }), { signal });
}

export function getMailQueueQueryOptions(filter: MailQueueFilter) {
  return queryOptions({
    queryKey: adminKeys.mailQueueList(filter),
    queryFn: ({ signal }) => getMailQueue({ ...filter, signal }),
    // The queue moves while you watch: refresh every few seconds.
    refetchInterval: 5000,
    placeholderData: keepPreviousData,
  });
}

export function useMailQueue(filter: MailQueueFilter) {
  return useQuery(getMailQueueQueryOptions(filter));
}
