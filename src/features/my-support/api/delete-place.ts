import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { mySupportKeys } from './get-my-pledges';

export function deletePlace(id: string) {
  return api.delete<void>(`/api/my-support/places/${encodeURIComponent(id)}`);
}

export function useDeletePlace() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: deletePlace,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: mySupportKeys.places() }),
  });
}
