import { useMutation, useQuery } from '@tanstack/react-query';
import type { DispatchFeedItem, PublicDispatchView } from '@shared/schemas/dispatch';
import { api } from '@/lib/api-client';
import { dispatchKeys } from './keys';

export const useDispatchFeed = () =>
  useQuery({
    queryKey: dispatchKeys.feed(),
    queryFn: ({ signal }) => api.get<{ dispatches: DispatchFeedItem[] }>('/api/public/dispatches', { signal }),
  });
export const usePublicDispatch = (slug: string) =>
  useQuery({
    queryKey: dispatchKeys.page(slug),
    queryFn: ({ signal }) => api.get<{ dispatch: PublicDispatchView }>(`/api/public/dispatches/${encodeURIComponent(slug)}`, { signal }),
  });
export const useUnsubscribe = () =>
  useMutation({
    mutationFn: ({ token, subscribed }: { token: string; subscribed: boolean }) =>
      api.post<{ category: string; subscribed: boolean }>(
        `/api/email-choices/${subscribed ? 'resubscribe' : 'unsubscribe'}?token=${encodeURIComponent(token)}`,
        {},
      ),
  });
