import { queryOptions, useQuery } from '@tanstack/react-query';
import type { HealthResponse } from '@shared/schemas/concepts';
import { api } from '@/lib/api-client';
import { conceptsPath, conceptsQueryKey } from './keys';

export type { HealthMessage, HealthResponse } from '@shared/schemas/concepts';

/** The serving version's health: sizes, norms, orthogonality, folding-in drift, advice. */
export function getConceptHealth(matterId: number, signal?: AbortSignal): Promise<HealthResponse> {
  return api.get<HealthResponse>(conceptsPath(matterId, 'health'), { signal });
}

export function conceptHealthQueryOptions(matterId: number) {
  return queryOptions({
    queryKey: [...conceptsQueryKey(matterId), 'health'],
    queryFn: ({ signal }) => getConceptHealth(matterId, signal),
  });
}

export function useConceptHealth(matterId: number) {
  return useQuery(conceptHealthQueryOptions(matterId));
}
