import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { RestoreResponse } from '@shared/schemas/trash';
import { api } from '@/lib/api-client';
import { documentsQueryKey } from '@/features/documents/api/get-documents';
import { indexStateQueryKey } from '@/features/indexing/api/get-index-state';
import { trashQueryKey } from './get-trash';

/** Puts a trashed document back with its attachments, codes and notes. */
export function restoreTrashItem(matterId: number, trashId: number): Promise<RestoreResponse> {
  return api.post<RestoreResponse>(`/api/matters/${matterId}/trash/${trashId}/restore`);
}

export function useRestoreTrashItem(matterId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (trashId: number) => restoreTrashItem(matterId, trashId),
    onSettled: async () => {
      await Promise.all([
        queryClient.invalidateQueries({ queryKey: trashQueryKey(matterId) }),
        queryClient.invalidateQueries({ queryKey: documentsQueryKey(matterId) }),
        queryClient.invalidateQueries({ queryKey: indexStateQueryKey(matterId) }),
      ]);
    },
  });
}
