import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { QcDecisionReq, QcItem } from '@shared/schemas/qc';
import { api } from '@/lib/api-client';
import { qcQueryKey } from './keys';

/** POST /api/matters/:matterId/qc/items/:itemId/decision: confirm or overturn a call. */
export function decideQcItem(matterId: number, itemId: number, body: QcDecisionReq) {
  return api.post<{ item: QcItem }>(`/api/matters/${matterId}/qc/items/${itemId}/decision`, body);
}

export function useDecideQcItem(matterId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (vars: { itemId: number } & QcDecisionReq) => {
      const { itemId, ...body } = vars;
      return decideQcItem(matterId, itemId, body);
    },
    onSettled: () => queryClient.invalidateQueries({ queryKey: qcQueryKey(matterId) }),
  });
}
