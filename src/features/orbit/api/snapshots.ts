import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import type { createSnapshotSchema } from '@shared/schemas/orbit';
import { api, withQuery } from '@/lib/api-client';
import type { PublicSnapshot, Snapshot, SnapshotSummary } from '../types';
import { orbitKeys } from './keys';

export type CreateSnapshotValues = z.input<typeof createSnapshotSchema>;

export function getSnapshots({ mine, signal }: { mine: boolean; signal?: AbortSignal }) {
  return api.get<{ snapshots: SnapshotSummary[] }>(withQuery('/api/orbit/snapshots', { mine: mine ? 'true' : undefined }), { signal });
}
export function getSnapshotsQueryOptions(mine: boolean) {
  return queryOptions({ queryKey: orbitKeys.snapshotList(mine), queryFn: ({ signal }) => getSnapshots({ mine, signal }) });
}
export function useSnapshots(mine: boolean) {
  return useQuery(getSnapshotsQueryOptions(mine));
}

export function getSnapshot({ id, signal }: { id: string; signal?: AbortSignal }) {
  return api.get<{ snapshot: Snapshot }>(`/api/orbit/snapshots/${encodeURIComponent(id)}`, { signal });
}
export function getSnapshotQueryOptions(id: string) {
  return queryOptions({ queryKey: orbitKeys.snapshot(id), queryFn: ({ signal }) => getSnapshot({ id, signal }) });
}
export function useSnapshot(id: string) {
  return useQuery(getSnapshotQueryOptions(id));
}

export function getPublicSnapshot({ slug, signal }: { slug: string; signal?: AbortSignal }) {
  return api.get<{ snapshot: PublicSnapshot }>(`/api/public/snapshots/${encodeURIComponent(slug)}`, { signal });
}
export function usePublicSnapshot(slug: string) {
  return useQuery({ queryKey: orbitKeys.publicSnapshot(slug), queryFn: ({ signal }) => getPublicSnapshot({ slug, signal }) });
}

export function createSnapshot(values: CreateSnapshotValues) {
  return api.post<{ snapshot: Snapshot }>('/api/orbit/snapshots', values);
}
export function useCreateSnapshot() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createSnapshot,
    onSuccess: async () => queryClient.invalidateQueries({ queryKey: orbitKeys.snapshots() }),
  });
}

export function updateSnapshot({ id, patch }: { id: string; patch: { title?: string; caption?: string; isPublic?: boolean } }) {
  return api.patch<{ snapshot: Snapshot }>(`/api/orbit/snapshots/${encodeURIComponent(id)}`, patch);
}
export function useUpdateSnapshot() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: updateSnapshot,
    onSuccess: async () => queryClient.invalidateQueries({ queryKey: orbitKeys.snapshots() }),
  });
}

export function deleteSnapshot({ id }: { id: string }) {
  return api.delete<void>(`/api/orbit/snapshots/${encodeURIComponent(id)}`);
}
export function useDeleteSnapshot() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: deleteSnapshot,
    onSuccess: async () => queryClient.invalidateQueries({ queryKey: orbitKeys.snapshots() }),
  });
}
