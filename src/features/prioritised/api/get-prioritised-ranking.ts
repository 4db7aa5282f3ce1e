import { queryOptions, useQuery } from '@tanstack/react-query';
import type { SearchResponse } from '@shared/schemas/search';
import { api } from '@/lib/api-client';

/** The search API in prioritised mode: the learned ranking's first page of uncoded documents. */
export function getPrioritisedRanking(matterId: number, limit: number, signal?: AbortSignal) {
  return api.post<SearchResponse>(
    `/api/matters/${matterId}/search`,
    { mode: 'prioritised', limit },
    { signal },
  );
}

export function prioritisedRankingQueryOptions(matterId: number, modelVersion: number, limit = 25) {
  return queryOptions({
    queryKey: ['matters', 'detail', matterId, 'prioritised', 'ranking', modelVersion, limit],
    queryFn: ({ signal }) => getPrioritisedRanking(matterId, limit, signal),
  });
}

export function usePrioritisedRanking(matterId: number, modelVersion: number | null) {
  return useQuery({
    ...prioritisedRankingQueryOptions(matterId, modelVersion ?? 0),
    enabled: modelVersion !== null,
  });
}
