import { queryOptions, useQuery } from '@tanstack/react-query';
import type { SavedSearchesResponse } from '@shared/schemas/saved-searches';
import { api } from '@/lib/api-client';

export type { SavedSearch } from '@shared/schemas/saved-searches';

/** GET /api/matters/:matterId/saved-searches, newest first. */
export function getSavedSearches(
  matterId: number,
  signal?: AbortSignal,
): Promise<SavedSearchesResponse> {
  return api.get<SavedSearchesResponse>(`/api/matters/${matterId}/saved-searches`, { signal });
}

export const savedSearchesQueryKey = (matterId: number) =>
  ['matters', 'detail', matterId, 'saved-searches'] as const;

export function savedSearchesQueryOptions(matterId: number) {
  return queryOptions({
    queryKey: savedSearchesQueryKey(matterId),
    queryFn: ({ signal }) => getSavedSearches(matterId, signal),
  });
}

export function useSavedSearches(matterId: number) {
  return useQuery(savedSearchesQueryOptions(matterId));
}
