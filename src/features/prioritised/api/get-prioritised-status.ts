import { queryOptions, useQuery } from '@tanstack/react-query';
import type { PrioritisedStatusResponse } from '@shared/schemas/prioritised';
import { api } from '@/lib/api-client';

export const prioritisedStatusKey = (matterId: number) =>
  ['matters', 'detail', matterId, 'prioritised', 'status'] as const;

/** GET /api/matters/:matterId/prioritised */
export function getPrioritisedStatus(matterId: number, signal?: AbortSignal) {
  return api.get<PrioritisedStatusResponse>(`/api/matters/${matterId}/prioritised`, { signal });
}

export function prioritisedStatusQueryOptions(matterId: number) {
  return queryOptions({
    queryKey: prioritisedStatusKey(matterId),
    queryFn: ({ signal }) => getPrioritisedStatus(matterId, signal),
    // While a model trains, follow it.
    refetchInterval: (query) => (query.state.data?.training ? 2000 : false),
  });
}

export function usePrioritisedStatus(matterId: number) {
  return useQuery(prioritisedStatusQueryOptions(matterId));
}
