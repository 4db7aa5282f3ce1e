import { queryOptions, useQuery } from '@tanstack/react-query';
import type { BatchKind, BatchesResponse } from '@shared/schemas/batches';
import { api } from '@/lib/api-client';
import { batchesQueryKey } from './keys';

export type { Batch, BatchesResponse } from '@shared/schemas/batches';

/** GET /api/matters/:matterId/batches (?mine=true: the caller's own). */
export function getBatches(
  matterId: number,
  filter: { mine?: boolean; kind?: BatchKind },
  signal?: AbortSignal,
): Promise<BatchesResponse> {
  return api.get<BatchesResponse>(`/api/matters/${matterId}/batches`, {
    signal,
    query: { mine: filter.mine ? 'true' : undefined, kind: filter.kind },
  });
}

export function batchesQueryOptions(
  matterId: number,
  filter: { mine?: boolean; kind?: BatchKind },
) {
  return queryOptions({
    queryKey: [...batchesQueryKey(matterId), 'list', filter],
    queryFn: ({ signal }) => getBatches(matterId, filter, signal),
  });
}

export function useBatches(matterId: number, filter: { mine?: boolean; kind?: BatchKind }) {
  return useQuery(batchesQueryOptions(matterId, filter));
}
