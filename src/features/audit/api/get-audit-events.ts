import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { AuditPageResponse } from '@shared/schemas/audit';
import { api } from '@/lib/api-client';

export type { AuditEvent, AuditPageResponse } from '@shared/schemas/audit';

export interface AuditFilters {
  /** User id. */
  actor?: string;
  action?: string;
  /** An inclusive day range, YYYY-MM-DD (UTC days). */
  from?: string;
  to?: string;
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
      from: filters.from,
      to: filters.to,
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

/** GET /api/matters/:matterId/audit.csv: the whole trail under the same filters (a download). */
export function auditCsvHref(matterId: number, filters: Omit<AuditFilters, 'before' | 'limit'>) {
  const query = new URLSearchParams();
  for (const key of ['actor', 'action', 'from', 'to'] as const) {
    const value = filters[key];
    if (value) query.set(key, value);
  }
  const qs = query.toString();
  return `/api/matters/${matterId}/audit.csv${qs ? `?${qs}` : ''}`;
}
