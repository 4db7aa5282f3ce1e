import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { AuditPageResponse } from '@shared/schemas/audit';
import { api } from '@/lib/api-client';

export type { AuditEvent, AuditPageResponse } from '@shared/schemas/audit';

export interface AuditFilters {
  /** User id. */
  actor?: string;
  action?: string;
  /** The previous page's nextCursor; absent for the newest page. */
  before?: number;
  limit: number;
}

export function getAuditEvents(
  matterId: number,
  filters: AuditFilters,
  signal?: AbortSignal,
): Promise<AuditPageResponse> {
  return api.get<AuditPageResponse>(`/api/matters/${matterId}/audit`, {
    signal,
    query: {
      actor: filters.actor,
      action: filters.action,
      before: filters.before,
      limit: filters.limit,
    },
  });
}

export function auditEventsQueryOptions(matterId: number, filters: AuditFilters) {
  return queryOptions({
    queryKey: ['matters', 'detail', matterId, 'audit', filters],
    queryFn: ({ signal }) => getAuditEvents(matterId, filters, signal),
    placeholderData: keepPreviousData,
    staleTime: 0,
  });
}

export function useAuditEvents(matterId: number, filters: AuditFilters) {
  return useQuery(auditEventsQueryOptions(matterId, filters));
}
