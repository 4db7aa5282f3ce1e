import { queryOptions, useQuery } from '@tanstack/react-query';
import type { SampleResponse } from '@shared/schemas/validation';
import { api } from '@/lib/api-client';

/** GET /api/matters/:matterId/validation/samples/:sampleId (report=1: the printable report, audited). */
export function getSample(
  matterId: number,
  sampleId: number,
  report: boolean,
  signal?: AbortSignal,
) {
  return api.get<SampleResponse>(`/api/matters/${matterId}/validation/samples/${sampleId}`, {
    signal,
    query: report ? { report: 1 } : undefined,
  });
}

export function sampleQueryOptions(matterId: number, sampleId: number, report = false) {
  return queryOptions({
    queryKey: ['matters', 'detail', matterId, 'validation', 'samples', sampleId, report],
    queryFn: ({ signal }) => getSample(matterId, sampleId, report, signal),
  });
}

export function useSample(matterId: number, sampleId: number, report = false) {
  return useQuery(sampleQueryOptions(matterId, sampleId, report));
}

export function sampleCsvHref(matterId: number, sampleId: number): string {
  return `/api/matters/${matterId}/validation/samples/${sampleId}/report.csv`;
}
