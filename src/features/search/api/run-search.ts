import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { SearchReq, SearchResponse } from '@shared/schemas/search';
import { api } from '@/lib/api-client';
import { searchesQueryKey } from './keys';

export type { SearchHit, SearchReq, SearchResponse } from '@shared/schemas/search';

/** POST /api/matters/:matterId/search: a query, or "more like this" (similarTo). Audited. */
export function runSearch(
  matterId: number,
  request: SearchReq,
  signal?: AbortSignal,
): Promise<SearchResponse> {
  return api.post<SearchResponse>(`/api/matters/${matterId}/search`, request, { signal });
}

export function searchQueryOptions(matterId: number, request: SearchReq | null) {
  return queryOptions({
    queryKey: [...searchesQueryKey(matterId), request],
    queryFn: ({ signal }) => runSearch(matterId, request as SearchReq, signal),
    enabled: request !== null,
    placeholderData: keepPreviousData,
    // Each run is written to the audit log: run again only when the person asks
    // (coding patches the cached hits instead of re-running the search).
    staleTime: Infinity,
    refetchOnWindowFocus: false,
    refetchOnReconnect: false,
    retry: false,
  });
}

export function useSearch(matterId: number, request: SearchReq | null) {
  return useQuery(searchQueryOptions(matterId, request));
}
