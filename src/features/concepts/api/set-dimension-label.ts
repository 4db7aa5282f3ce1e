import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { DimensionLabelReq, DimensionLabelResponse } from '@shared/schemas/concepts';
import { api } from '@/lib/api-client';
import { dimensionsQueryKey } from './get-dimensions';
import { conceptsPath } from './keys';

/** PUT .../concepts/dimensions/:dim/label (concepts.label): names a dimension of this version. */
export function setDimensionLabel(
  matterId: number,
  dim: number,
  body: DimensionLabelReq,
): Promise<DimensionLabelResponse> {
  return api.put<DimensionLabelResponse>(conceptsPath(matterId, `dimensions/${dim}/label`), body);
}

export function useSetDimensionLabel(matterId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ dim, label }: { dim: number; label: string }) =>
      setDimensionLabel(matterId, dim, { label }),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: dimensionsQueryKey(matterId) }),
  });
}
