import { queryOptions, useQuery } from '@tanstack/react-query';
import type { IndexStateResponse } from '@shared/schemas/indexing';
import { api } from '@/lib/api-client';
import { isJobActive } from '@/features/jobs/api/get-matter-jobs';

export type { IndexCounts, IndexStateResponse, IndexVersionInfo } from '@shared/schemas/indexing';

/** The state of the matter's concept-space index: counts, serving version, any build. */
export function getIndexState(matterId: number, signal?: AbortSignal): Promise<IndexStateResponse> {
  return api.get<IndexStateResponse>(`/api/matters/${matterId}/index`, { signal });
}

export const indexStateQueryKey = (matterId: number) =>
  ['matters', 'detail', matterId, 'index'] as const;

export function indexStateQueryOptions(matterId: number) {
  return queryOptions({
    queryKey: indexStateQueryKey(matterId),
    queryFn: ({ signal }) => getIndexState(matterId, signal),
    staleTime: 0,
    // While a build or an extraction runs the counts move: poll, then stop.
    refetchInterval: (query) => {
      const data = query.state.data;
      if (!data) return false;
      const active = (data.activeJob && isJobActive(data.activeJob)) || data.building != null;
      return active ? 1_500 : false;
    },
  });
}

export function useIndexState(matterId: number) {
  return useQuery(indexStateQueryOptions(matterId));
}
