import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { liveOrbitKeys } from './get-latest-set';

export type OrbitSummary = {
  spacecraft: { name: string; slug: string; catalogNumber: string; sailDeployedAt: string | null };
  latest: { epoch: string; apogeeKm: number; perigeeKm: number; meanAltitudeKm: number } | null;
  sinceSailDeployment: {
    fromEpoch: string;
    days: number;
    apogeeChangeKm: number;
    perigeeChangeKm: number;
    apogeeKmPerDay: number | null;
    perigeeKmPerDay: number | null;
  } | null;
  trend: { epochMs: number; apogeeKm: number; perigeeKm: number; sets: number }[];
  sailYield: {
    accelMPerS2: number;
    uncertaintyMPerS2: number | null;
    energyJPerKgPerDay: number;
    semiMajorAxisKmPerDay: number;
    atSemiMajorAxisKm: number;
    raisingPeriods: number;
    edgeOnPeriods: number;
  } | null;
  caution: string;
};

/** The mission craft's public orbit summary (GET /api/public/orbit). */
export function getOrbitSummary({ signal }: { signal?: AbortSignal } = {}) {
  return api.get<OrbitSummary>('/api/public/orbit', { signal });
}

export function getOrbitSummaryQueryOptions() {
  return queryOptions({
    queryKey: [...liveOrbitKeys.all, 'summary'] as const,
    queryFn: ({ signal }) => getOrbitSummary({ signal }),
    staleTime: 10 * 60_000,
  });
}

export function useOrbitSummary() {
  return useQuery(getOrbitSummaryQueryOptions());
}
