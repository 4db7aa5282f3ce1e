import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { CreateBatchesReq, CreateBatchesResponse } from '@shared/schemas/batches';
import { api } from '@/lib/api-client';
import { batchesQueryKey } from './keys';

/** POST /api/matters/:matterId/batches: cut batches from a search or saved search. */
export function createBatches(matterId: number, body: CreateBatchesReq) {
  return api.post<CreateBatchesResponse>(`/api/matters/${matterId}/batches`, body);
}

export function useCreateBatches(matterId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: CreateBatchesReq) => createBatches(matterId, body),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: batchesQueryKey(matterId) }),
  });
}
