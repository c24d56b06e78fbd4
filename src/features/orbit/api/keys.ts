import type { HistoryParams } from '../types';

export const orbitKeys = {
  all: ['orbit'] as const,
  spacecraft: () => [...orbitKeys.all, 'spacecraft'] as const,
  craft: (id: string) => [...orbitKeys.all, 'craft', id] as const,
  history: (id: string) => [...orbitKeys.craft(id), 'history'] as const,
  historyPage: (id: string, params: HistoryParams) => [...orbitKeys.history(id), params] as const,
  trend: (id: string) => [...orbitKeys.craft(id), 'trend'] as const,
  trendView: (id: string, view: { viewFrom?: string; viewTo?: string; columns?: number }) =>
    [...orbitKeys.trend(id), 'view', view] as const,
  trendRates: (id: string, window: { from?: string; to?: string }) => [...orbitKeys.trend(id), 'rates', window] as const,
  sailYield: (id: string) => [...orbitKeys.craft(id), 'sail-yield'] as const,
  sailingPeriods: (id: string) => [...orbitKeys.craft(id), 'sailing-periods'] as const,
  uploads: () => [...orbitKeys.all, 'uploads'] as const,
  upload: (jobId: string) => [...orbitKeys.uploads(), jobId] as const,
  snapshots: () => [...orbitKeys.all, 'snapshots'] as const,
  snapshotList: (mine: boolean) => [...orbitKeys.snapshots(), 'list', { mine }] as const,
  snapshot: (id: string) => [...orbitKeys.snapshots(), id] as const,
  publicSnapshot: (slug: string) => ['public-snapshot', slug] as const,
};
