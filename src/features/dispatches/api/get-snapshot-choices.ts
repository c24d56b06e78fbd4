import { useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { dispatchKeys } from './keys';

export type SnapshotChoice = { id: string; title: string; caption: string; pngPath: string };
export const useSnapshotChoices = () =>
  useQuery({
    queryKey: [...dispatchKeys.all, 'snapshot-choices'],
    queryFn: ({ signal }) => api.get<{ snapshots: SnapshotChoice[] }>('/api/orbit/snapshots', { signal }),
  });
