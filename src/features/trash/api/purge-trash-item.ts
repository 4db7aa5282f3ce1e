import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { PurgeResponse } from '@shared/schemas/trash';
import { api } from '@/lib/api-client';
import { indexStateQueryKey } from '@/features/indexing/api/get-index-state';
import { trashQueryKey } from './get-trash';

/** Destroys a trashed document for good: text, indexes and (unless shared) the original. */
export function purgeTrashItem(matterId: number, trashId: number): Promise<PurgeResponse> {
  return api.delete<PurgeResponse>(`/api/matters/${matterId}/trash/${trashId}`);
}

export function usePurgeTrashItem(matterId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (trashId: number) => purgeTrashItem(matterId, trashId),
    onSettled: async () => {
      await Promise.all([
        queryClient.invalidateQueries({ queryKey: trashQueryKey(matterId) }),
        queryClient.invalidateQueries({ queryKey: indexStateQueryKey(matterId) }),
      ]);
    },
  });
}
