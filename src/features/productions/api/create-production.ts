import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { CreateProductionReq, ProductionResponse } from '@shared/schemas/productions';
import { api } from '@/lib/api-client';
import { productionKeys } from '../keys';

/** POST /api/matters/:matterId/productions (productions.manage). */
export function createProduction(matterId: number, body: CreateProductionReq) {
  return api.post<ProductionResponse>(`/api/matters/${matterId}/productions`, body);
}

export function useCreateProduction(matterId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: CreateProductionReq) => createProduction(matterId, body),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: productionKeys.all(matterId) }),
  });
}
