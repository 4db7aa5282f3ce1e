import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { Batch } from '@shared/schemas/batches';
import { api } from '@/lib/api-client';
import { batchesQueryKey } from './keys';

/** POST /api/matters/:matterId/batches/:batchId/assign */
export function assignBatch(matterId: number, vars: { batchId: number; userId: string }) {
  return api.post<{ batch: Batch }>(`/api/matters/${matterId}/batches/${vars.batchId}/assign`, {
    userId: vars.userId,
  });
}

export function useAssignBatch(matterId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (vars: { batchId: number; userId: string }) => assignBatch(matterId, vars),
    onSettled: () => queryClient.invalidateQueries({ queryKey: batchesQueryKey(matterId) }),
  });
}
