import { queryOptions, useQuery } from '@tanstack/react-query';
import type { RecentSearchesResponse } from '@shared/schemas/saved-searches';
import { api } from '@/lib/api-client';

export type { RecentSearch } from '@shared/schemas/saved-searches';

/** GET /api/matters/:matterId/searches/recent: the caller's last distinct searches. */
export function getRecentSearches(
  matterId: number,
  signal?: AbortSignal,
): Promise<RecentSearchesResponse> {
  return api.get<RecentSearchesResponse>(`/api/matters/${matterId}/searches/recent`, { signal });
}

export const recentSearchesQueryKey = (matterId: number) =>
  ['matters', 'detail', matterId, 'searches', 'recent'] as const;

export function recentSearchesQueryOptions(matterId: number) {
  return queryOptions({
    queryKey: recentSearchesQueryKey(matterId),
    queryFn: ({ signal }) => getRecentSearches(matterId, signal),
  });
}

export function useRecentSearches(matterId: number) {
  return useQuery(recentSearchesQueryOptions(matterId));
}
