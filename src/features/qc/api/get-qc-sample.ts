import { queryOptions, useQuery } from '@tanstack/react-query';
import type { QcSampleResponse } from '@shared/schemas/qc';
import { api } from '@/lib/api-client';
import { qcQueryKey } from './keys';

/** GET /api/matters/:matterId/qc/samples/:sampleId: the sample and its calls. */
export function getQcSample(matterId: number, sampleId: number, signal?: AbortSignal) {
  return api.get<QcSampleResponse>(`/api/matters/${matterId}/qc/samples/${sampleId}`, { signal });
}

export function qcSampleQueryOptions(matterId: number, sampleId: number) {
  return queryOptions({
    queryKey: [...qcQueryKey(matterId), 'sample', sampleId],
    queryFn: ({ signal }) => getQcSample(matterId, sampleId, signal),
  });
}

export function useQcSample(matterId: number, sampleId: number) {
  return useQuery(qcSampleQueryOptions(matterId, sampleId));
}
