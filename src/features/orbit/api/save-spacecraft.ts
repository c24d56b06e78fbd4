import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import type { spacecraftInputSchema } from '@shared/schemas/orbit';
import { api } from '@/lib/api-client';
import type { Spacecraft } from '../types';
import { orbitKeys } from './keys';

export type SpacecraftFormValues = z.output<typeof spacecraftInputSchema>;

export function saveSpacecraft({ id, values }: { id?: string; values: SpacecraftFormValues }) {
  return id
    ? api.put<{ spacecraft: Spacecraft }>(`/api/orbit/spacecraft/${encodeURIComponent(id)}`, values)
    : api.post<{ spacecraft: Spacecraft }>('/api/orbit/spacecraft', values);
}

export function useSaveSpacecraft() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: saveSpacecraft,
    onSuccess: async () => queryClient.invalidateQueries({ queryKey: orbitKeys.all }),
  });
}
