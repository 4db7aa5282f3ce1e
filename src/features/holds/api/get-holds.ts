import { queryOptions, useQuery } from '@tanstack/react-query';
import type { HoldsResponse } from '@shared/schemas/holds';
import { api } from '@/lib/api-client';

export type { HoldsResponse, LegalHold } from '@shared/schemas/holds';

/** The matter's legal holds, active first. */
export function getHolds(matterId: number, signal?: AbortSignal): Promise<HoldsResponse> {
  return api.get<HoldsResponse>(`/api/matters/${matterId}/holds`, { signal });
}

export const holdsQueryKey = (matterId: number) =>
  ['matters', 'detail', matterId, 'holds'] as const;

export function holdsQueryOptions(matterId: number) {
  return queryOptions({
    queryKey: holdsQueryKey(matterId),
    queryFn: ({ signal }) => getHolds(matterId, signal),
  });
}

export function useHolds(matterId: number) {
  return useQuery(holdsQueryOptions(matterId));
}
