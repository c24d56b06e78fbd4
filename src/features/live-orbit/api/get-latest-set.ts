import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';

export type LatestSet = {
  spacecraft: { name: string; slug: string };
  latest: { line1: string; line2: string; epoch: string } | null;
  caution: string;
};

export const liveOrbitKeys = {
  all: ['live-orbit'] as const,
  latestSet: (slug: string) => [...liveOrbitKeys.all, 'latest-set', slug] as const,
};

export function getLatestSet(slug: string, { signal }: { signal?: AbortSignal } = {}) {
  return api.get<LatestSet>(`/api/public/orbit/${encodeURIComponent(slug)}/latest-set`, { signal });
}

export function getLatestSetQueryOptions(slug: string) {
  return queryOptions({
    queryKey: liveOrbitKeys.latestSet(slug),
    queryFn: ({ signal }) => getLatestSet(slug, { signal }),
    staleTime: 10 * 60_000,
    // A page left open picks up a newer set when the engineers upload one.
    refetchInterval: 30 * 60_000,
  });
}

export function useLatestSet(slug: string) {
  return useQuery(getLatestSetQueryOptions(slug));
}

/** The mission craft's public handle. */
export const MISSION_CRAFT_SLUG = 'tern-1';
