import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { indexStateQueryKey } from '@/features/indexing/api/get-index-state';
import { matterQueryOptions } from '@/features/matters/api/get-matter';
import { documentsQueryKey } from './get-documents';

/** Removes a document from the matter (the audit log keeps the record of it). */
export function deleteDocument(matterId: number, docId: number): Promise<void> {
  return api.delete<void>(`/api/matters/${matterId}/documents/${docId}`);
}

export function useDeleteDocument(matterId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (docId: number) => deleteDocument(matterId, docId),
    onSettled: async () => {
      await Promise.all([
        queryClient.invalidateQueries({ queryKey: documentsQueryKey(matterId) }),
        queryClient.invalidateQueries({ queryKey: indexStateQueryKey(matterId) }),
        queryClient.invalidateQueries({
          queryKey: matterQueryOptions(matterId).queryKey,
          exact: true,
        }),
      ]);
    },
  });
}
