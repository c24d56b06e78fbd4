import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { EmailPreferences } from '@shared/schemas/campaign';
import { api } from '@/lib/api-client';
import { mySupportKeys } from './get-my-pledges';

export function getEmailPreferences({ signal }: { signal?: AbortSignal } = {}) {
  return api.get<{ preferences: EmailPreferences }>('/api/my-support/email-preferences', { signal }).then((r) => r.preferences);
}

export function getEmailPreferencesQueryOptions() {
  return queryOptions({ queryKey: mySupportKeys.emailPreferences(), queryFn: ({ signal }) => getEmailPreferences({ signal }) });
}

export function useEmailPreferences() {
  return useQuery(getEmailPreferencesQueryOptions());
}

export function updateEmailPreferences(input: EmailPreferences) {
  return api.put<{ preferences: EmailPreferences }>('/api/my-support/email-preferences', input).then((r) => r.preferences);
}

export function useUpdateEmailPreferences() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: updateEmailPreferences,
    onSuccess: (prefs) => queryClient.setQueryData(mySupportKeys.emailPreferences(), prefs),
  });
}
