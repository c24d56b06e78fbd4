import { queryOptions, useQuery } from '@tanstack/react-query';
import type { SavedPlacesView } from '@shared/schemas/places';
import { api } from '@/lib/api-client';
import { mySupportKeys } from './get-my-pledges';

export function getSavedPlaces({ signal }: { signal?: AbortSignal } = {}) {
  return api.get<SavedPlacesView>('/api/my-support/places', { signal });
}

export function getSavedPlacesQueryOptions() {
  return queryOptions({ queryKey: mySupportKeys.places(), queryFn: ({ signal }) => getSavedPlaces({ signal }) });
}

export function useSavedPlaces({ enabled = true }: { enabled?: boolean } = {}) {
  return useQuery({ ...getSavedPlacesQueryOptions(), enabled });
}
