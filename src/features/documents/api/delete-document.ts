import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { DeleteDocumentResponse } from '@shared/schemas/trash';
import { api } from '@/lib/api-client';
import { indexStateQueryKey } from '@/features/indexing/api/get-index-state';
import { matterQueryOptions } from '@/features/matters/api/get-matter';
import { trashQueryKey } from '@/features/trash/api/get-trash';
import { documentsQueryKey } from './get-documents';

/**
 * Deletes a document with its attachments. A coded one needs a reason and goes to the
 * trash; any other is deleted for good; a legal hold refuses both (409). The activity log
 * keeps the record either way.
 */
export function deleteDocument(
  matterId: number,
  docId: number,
  reason?: string,
): Promise<DeleteDocumentResponse> {
  return api.delete<DeleteDocumentResponse>(
    `/api/matters/${matterId}/documents/${docId}`,
    reason ? { reason } : undefined,
  );
}

export function useDeleteDocument(matterId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ docId, reason }: { docId: number; reason?: string }) =>
      deleteDocument(matterId, docId, reason),
    onSettled: async () => {
      await Promise.all([
        queryClient.invalidateQueries({ queryKey: documentsQueryKey(matterId) }),
        queryClient.invalidateQueries({ queryKey: indexStateQueryKey(matterId) }),
        queryClient.invalidateQueries({ queryKey: trashQueryKey(matterId) }),
        queryClient.invalidateQueries({
          queryKey: matterQueryOptions(matterId).queryKey,
          exact: true,
        }),
      ]);
    },
  });
}
