import { queryOptions, useQuery } from '@tanstack/react-query';
import type { MattersResponse } from '@shared/schemas/matters';
import { api } from '@/lib/api-client';

export type { MatterSummary, MattersResponse } from '@shared/schemas/matters';

export function getMyMatters(signal?: AbortSignal): Promise<MattersResponse> {
  return api.get<MattersResponse>('/api/matters', { signal });
}

export function myMattersQueryOptions() {
  return queryOptions({
    queryKey: ['matters', 'mine'],
    queryFn: ({ signal }) => getMyMatters(signal),
  });
}

export function useMyMatters() {
  return useQuery(myMattersQueryOptions());
}
