import { queryOptions, useQuery } from '@tanstack/react-query';
import type { NeighboursQuery, NeighboursResponse } from '@shared/schemas/concepts';
import { api } from '@/lib/api-client';
import { conceptsPath, conceptsQueryKey } from './keys';

export type { NeighbourTerm, NeighboursResponse } from '@shared/schemas/concepts';

/** The terms nearest to a word in the concept space, with their cosine similarity. */
export function getTermNeighbours(
  matterId: number,
  query: NeighboursQuery,
  signal?: AbortSignal,
): Promise<NeighboursResponse> {
  return api.get<NeighboursResponse>(conceptsPath(matterId, 'terms/neighbours'), {
    signal,
    query: { term: query.term, n: query.n },
  });
}

export function termNeighboursQueryOptions(matterId: number, query: NeighboursQuery) {
  return queryOptions({
    queryKey: [...conceptsQueryKey(matterId), 'neighbours', query],
    queryFn: ({ signal }) => getTermNeighbours(matterId, query, signal),
  });
}

/** Runs only once a term is given. */
export function useTermNeighbours(matterId: number, query: NeighboursQuery | null) {
  return useQuery({
    ...termNeighboursQueryOptions(matterId, query ?? { term: '', n: 1 }),
    enabled: query != null && query.term.trim() !== '',
  });
}
