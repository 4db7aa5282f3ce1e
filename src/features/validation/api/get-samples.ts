import { queryOptions, useQuery } from '@tanstack/react-query';
import type { SamplesResponse } from '@shared/schemas/validation';
import { api } from '@/lib/api-client';

export const samplesKey = (matterId: number) =>
  ['matters', 'detail', matterId, 'validation', 'samples'] as const;

/** GET /api/matters/:matterId/validation/samples */
export function getSamples(matterId: number, signal?: AbortSignal) {
  return api.get<SamplesResponse>(`/api/matters/${matterId}/validation/samples`, { signal });
}

export function samplesQueryOptions(matterId: number) {
  return queryOptions({
    queryKey: samplesKey(matterId),
    queryFn: ({ signal }) => getSamples(matterId, signal),
  });
}

export function useSamples(matterId: number) {
  return useQuery(samplesQueryOptions(matterId));
}
