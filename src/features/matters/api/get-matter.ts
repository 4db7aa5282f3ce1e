import { queryOptions, useQuery } from '@tanstack/react-query';
import type { MatterHomeResponse } from '@shared/schemas/matters';
import { api } from '@/lib/api-client';

export type { MatterHomeResponse } from '@shared/schemas/matters';

/** The matter, the caller's role and permissions on it, its leads and counts. */
export function getMatter(matterId: number, signal?: AbortSignal): Promise<MatterHomeResponse> {
  return api.get<MatterHomeResponse>(`/api/matters/${matterId}`, { signal });
}

export function matterQueryOptions(matterId: number) {
  return queryOptions({
    queryKey: ['matters', 'detail', matterId],
    queryFn: ({ signal }) => getMatter(matterId, signal),
  });
}

export function useMatter(matterId: number) {
  return useQuery(matterQueryOptions(matterId));
}
