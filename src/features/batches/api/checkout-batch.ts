import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { Batch } from '@shared/schemas/batches';
import { api } from '@/lib/api-client';
import { batchesQueryKey } from './keys';

/** POST /api/matters/:matterId/batches/:batchId/checkout */
export function checkoutBatch(matterId: number, vars: { batchId: number }) {
  return api.post<{ batch: Batch }>(`/api/matters/${matterId}/batches/${vars.batchId}/checkout`);
}

export function useCheckoutBatch(matterId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (vars: { batchId: number }) => checkoutBatch(matterId, vars),
    onSettled: () => queryClient.invalidateQueries({ queryKey: batchesQueryKey(matterId) }),
  });
}
