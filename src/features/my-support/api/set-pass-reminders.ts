import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { PassRemindersInput, SavedPlacesView } from '@shared/schemas/places';
import { api } from '@/lib/api-client';
import { mySupportKeys } from './get-my-pledges';

export function setPassReminders(input: PassRemindersInput) {
  return api.put<SavedPlacesView>('/api/my-support/places/reminders', input);
}

export function useSetPassReminders() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: setPassReminders,
    onSuccess: (view) => queryClient.setQueryData(mySupportKeys.places(), view),
  });
}
