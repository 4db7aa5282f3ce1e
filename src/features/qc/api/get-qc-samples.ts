import { queryOptions, useQuery } from '@tanstack/react-query';
import type { QcSamplesResponse } from '@shared/schemas/qc';
import { api } from '@/lib/api-client';
import { qcQueryKey } from './keys';

/** GET /api/matters/:matterId/qc/samples (the lead). */
export function getQcSamples(matterId: number, signal?: AbortSignal) {
  return api.get<QcSamplesResponse>(`/api/matters/${matterId}/qc/samples`, { signal });
}

export function qcSamplesQueryOptions(matterId: number) {
  return queryOptions({
    queryKey: [...qcQueryKey(matterId), 'samples'],
    queryFn: ({ signal }) => getQcSamples(matterId, signal),
  });
}

export function useQcSamples(matterId: number, enabled = true) {
  return useQuery({ ...qcSamplesQueryOptions(matterId), enabled });
}
