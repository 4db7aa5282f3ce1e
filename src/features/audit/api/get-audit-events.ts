import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';

export interface AuditEvent {
  id: number;
  at: string;
  action: string;
  actorId: string | null;
  actorEmail: string | null;
  actorName: string | null;
  target: string | null;
  detail: Record<string, unknown>;
}

export interface AuditFilters {
  actor?: string;
  action?: string;
  page: number;
  pageSize: number;
}

export interface AuditEventsResponse {
  events: AuditEvent[];
  total: number;
  /** Distinct actions and people on this matter's log, for the filter menus. */
  actions?: string[];
  actors?: { id: string; name: string; email: string }[];
}

export function getAuditEvents(
  matterId: number,
  filters: AuditFilters,
  signal?: AbortSignal,
): Promise<AuditEventsResponse> {
  return api.get<AuditEventsResponse>(`/api/matters/${matterId}/audit`, {
    signal,
    query: {
      actor: filters.actor,
      action: filters.action,
      limit: filters.pageSize,
      offset: filters.page * filters.pageSize,
    },
  });
}

export function auditEventsQueryOptions(matterId: number, filters: AuditFilters) {
  return queryOptions({
    queryKey: ['matters', 'detail', matterId, 'audit', filters],
    queryFn: ({ signal }) => getAuditEvents(matterId, filters, signal),
    placeholderData: keepPreviousData,
  });
}

export function useAuditEvents(matterId: number, filters: AuditFilters) {
  return useQuery(auditEventsQueryOptions(matterId, filters));
}
