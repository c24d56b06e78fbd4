import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import type { SavedPlaceView, savePlaceSchema } from '@shared/schemas/places';
import { api } from '@/lib/api-client';
import { mySupportKeys } from './get-my-pledges';

export function savePlace(input: z.input<typeof savePlaceSchema>) {
  return api.post<{ place: SavedPlaceView }>('/api/my-support/places', input).then((r) => r.place);
}

export function useSavePlace() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: savePlace,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: mySupportKeys.places() }),
  });
}
