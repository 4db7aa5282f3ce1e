import { queryOptions, useQuery } from '@tanstack/react-query';
import type { OverturnRatesResponse } from '@shared/schemas/qc';
import { api } from '@/lib/api-client';
import { qcQueryKey } from './keys';

/** GET /api/matters/:matterId/qc/overturn-rates (the lead). */
export function getOverturnRates(matterId: number, signal?: AbortSignal) {
  return api.get<OverturnRatesResponse>(`/api/matters/${matterId}/qc/overturn-rates`, { signal });
}

export function overturnRatesQueryOptions(matterId: number) {
  return queryOptions({
    queryKey: [...qcQueryKey(matterId), 'rates'],
    queryFn: ({ signal }) => getOverturnRates(matterId, signal),
  });
}

export function useOverturnRates(matterId: number, enabled = true) {
  return useQuery({ ...overturnRatesQueryOptions(matterId), enabled });
}
