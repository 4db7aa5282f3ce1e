import { queryOptions, useQuery } from '@tanstack/react-query';
import type { ProductionsResponse } from '@shared/schemas/productions';
import { api } from '@/lib/api-client';
import { productionKeys } from '../keys';

export type { Production } from '@shared/schemas/productions';

/** GET /api/matters/:matterId/productions, newest first. */
export function getProductions(matterId: number, signal?: AbortSignal) {
  return api.get<ProductionsResponse>(`/api/matters/${matterId}/productions`, { signal });
}

export function productionsQueryOptions(matterId: number) {
  return queryOptions({
    queryKey: productionKeys.all(matterId),
    queryFn: ({ signal }) => getProductions(matterId, signal),
  });
}

export function useProductions(matterId: number) {
  return useQuery(productionsQueryOptions(matterId));
}
