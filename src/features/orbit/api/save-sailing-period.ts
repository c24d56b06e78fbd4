import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import type { sailingPeriodInputSchema } from '@shared/schemas/orbit';
import { api } from '@/lib/api-client';
import type { SailingPeriod } from '../types';
import { orbitKeys } from './keys';

export type SailingPeriodValues = z.input<typeof sailingPeriodInputSchema>;

export function saveSailingPeriod({ spacecraftId, id, values }: { spacecraftId: string; id?: string; values: SailingPeriodValues }) {
  return id
    ? api.put<{ sailingPeriod: SailingPeriod }>(`/api/orbit/sailing-periods/${encodeURIComponent(id)}`, values)
    : api.post<{ sailingPeriod: SailingPeriod }>(`/api/orbit/spacecraft/${encodeURIComponent(spacecraftId)}/sailing-periods`, values);
}

export function deleteSailingPeriod({ id }: { spacecraftId: string; id: string }) {
  return api.delete<void>(`/api/orbit/sailing-periods/${encodeURIComponent(id)}`);
}

// The log feeds the trend's shading and the sail-yield comparison, so both are refetched.
export function useSaveSailingPeriod() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: saveSailingPeriod,
    onSuccess: async (_r, { spacecraftId }) => queryClient.invalidateQueries({ queryKey: orbitKeys.craft(spacecraftId) }),
  });
}

export function useDeleteSailingPeriod() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: deleteSailingPeriod,
    onSuccess: async (_r, { spacecraftId }) => queryClient.invalidateQueries({ queryKey: orbitKeys.craft(spacecraftId) }),
  });
}
