import { queryOptions, useQuery } from '@tanstack/react-query';
import { api, withQuery } from '@/lib/api-client';
import { adminKeys } from './keys';

export type AuditEntry = {
  id: number | string;
  at: string;
  actor: { id: string; email: string } | null;
  action: string;
  subjectType: string;
  subjectId: string | null;
  before: unknown;
  after: unknown;
};

export function getAudit({ limit, signal }: { limit: number; signal?: AbortSignal }): Promise<{ entries: AuditEntry[] }> {
  return api.get<{ entries: AuditEntry[] }>(withQuery('/api/admin/audit', { limit }), { signal });
}

export function getAuditQueryOptions({ limit = 100 }: { limit?: number } = {}) {
  return queryOptions({
    queryKey: adminKeys.auditList(limit),
    queryFn: ({ signal }) => getAudit({ limit, signal }),
  });
}

export function useAudit({ limit = 100 }: { limit?: number } = {}) {
  return useQuery(getAuditQueryOptions({ limit }));
}
