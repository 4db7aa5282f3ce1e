import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { ProductionResponse, ResolveFamilyReq } from '@shared/schemas/productions';
import { api } from '@/lib/api-client';
import { productionKeys } from '../keys';

/** POST .../productions/:productionId/family: add family members or slip-sheet them. */
export function resolveFamily(matterId: number, productionId: number, body: ResolveFamilyReq) {
  return api.post<ProductionResponse>(
    `/api/matters/${matterId}/productions/${productionId}/family`,
    body,
  );
}

export function useResolveFamily(matterId: number, productionId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: ResolveFamilyReq) => resolveFamily(matterId, productionId, body),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: productionKeys.all(matterId) }),
  });
}
