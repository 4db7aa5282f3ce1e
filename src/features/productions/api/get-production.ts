import { queryOptions, useQuery } from '@tanstack/react-query';
import type { ProductionResponse } from '@shared/schemas/productions';
import { api } from '@/lib/api-client';
import { productionKeys } from '../keys';

/** GET /api/matters/:matterId/productions/:productionId (state, counts, family check). */
export function getProduction(matterId: number, productionId: number, signal?: AbortSignal) {
  return api.get<ProductionResponse>(`/api/matters/${matterId}/productions/${productionId}`, {
    signal,
  });
}

export function productionQueryOptions(matterId: number, productionId: number) {
  return queryOptions({
    queryKey: productionKeys.detail(matterId, productionId),
    queryFn: ({ signal }) => getProduction(matterId, productionId, signal),
    // While it builds, follow it until it settles.
    refetchInterval: (query) => (query.state.data?.production.state === 'building' ? 1_500 : false),
  });
}

export function useProduction(matterId: number, productionId: number | null) {
  return useQuery({
    ...productionQueryOptions(matterId, productionId ?? 0),
    enabled: productionId != null,
  });
}
