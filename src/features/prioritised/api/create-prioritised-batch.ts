import { useMutation } from '@tanstack/react-query';
import type { PrioritisedBatchReq, PrioritisedBatchResponse } from '@shared/schemas/prioritised';
import { api } from '@/lib/api-client';

/** POST /api/matters/:matterId/prioritised/batches (ranking.train). */
export function createPrioritisedBatch(matterId: number, body: PrioritisedBatchReq) {
  return api.post<PrioritisedBatchResponse>(`/api/matters/${matterId}/prioritised/batches`, body);
}

export function useCreatePrioritisedBatch(matterId: number) {
  return useMutation({
    mutationFn: (body: PrioritisedBatchReq) => createPrioritisedBatch(matterId, body),
  });
}
