import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { DimensionLabelResponse } from '@shared/schemas/concepts';
import { api } from '@/lib/api-client';
import { dimensionsQueryKey } from './get-dimensions';
import { conceptsPath } from './keys';

/** DELETE .../concepts/dimensions/:dim/label (concepts.label): removes a dimension's label. */
export function clearDimensionLabel(
  matterId: number,
  dim: number,
): Promise<DimensionLabelResponse> {
  return api.delete<DimensionLabelResponse>(conceptsPath(matterId, `dimensions/${dim}/label`));
}

export function useClearDimensionLabel(matterId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (dim: number) => clearDimensionLabel(matterId, dim),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: dimensionsQueryKey(matterId) }),
  });
}
