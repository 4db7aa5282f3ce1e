import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { Batch } from '@shared/schemas/batches';
import { api } from '@/lib/api-client';
import { batchesQueryKey } from './keys';

/** POST /api/matters/:matterId/batches/:batchId/checkin */
export function checkinBatch(matterId: number, vars: { batchId: number }) {
  return api.post<{ batch: Batch }>(`/api/matters/${matterId}/batches/${vars.batchId}/checkin`);
}

export function useCheckinBatch(matterId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (vars: { batchId: number }) => checkinBatch(matterId, vars),
    onSettled: () => queryClient.invalidateQueries({ queryKey: batchesQueryKey(matterId) }),
  });
}
