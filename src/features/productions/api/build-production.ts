import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { JobResponse } from '@shared/schemas/jobs';
import { api } from '@/lib/api-client';
import { productionKeys } from '../keys';

/** POST .../productions/:productionId/build: starts the background build; returns its job. */
export function buildProduction(matterId: number, productionId: number) {
  return api.post<JobResponse>(`/api/matters/${matterId}/productions/${productionId}/build`);
}

export function useBuildProduction(matterId: number, productionId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: () => buildProduction(matterId, productionId),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: productionKeys.all(matterId) }),
  });
}

/** The download link of a built production (a plain GET; the browser saves the zip). */
export const productionDownloadHref = (matterId: number, productionId: number) =>
  `/api/matters/${matterId}/productions/${productionId}/download`;
