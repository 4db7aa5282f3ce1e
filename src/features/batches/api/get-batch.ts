import { queryOptions, useQuery } from '@tanstack/react-query';
import type { BatchResponse } from '@shared/schemas/batches';
import { api } from '@/lib/api-client';
import { batchesQueryKey } from './keys';

export type { BatchDocument, BatchResponse } from '@shared/schemas/batches';

/** GET /api/matters/:matterId/batches/:batchId: the batch and its documents in order. */
export function getBatch(matterId: number, batchId: number, signal?: AbortSignal) {
  return api.get<BatchResponse>(`/api/matters/${matterId}/batches/${batchId}`, { signal });
}

export function batchQueryOptions(matterId: number, batchId: number) {
  return queryOptions({
    queryKey: [...batchesQueryKey(matterId), 'one', batchId],
    queryFn: ({ signal }) => getBatch(matterId, batchId, signal),
  });
}

export function useBatch(matterId: number, batchId: number | null) {
  return useQuery({ ...batchQueryOptions(matterId, batchId ?? 0), enabled: batchId !== null });
}
