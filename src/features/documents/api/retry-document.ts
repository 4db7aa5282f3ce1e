import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { RetryDocumentResponse } from '@shared/schemas/documents';
import { api } from '@/lib/api-client';
import { indexStateQueryKey } from '@/features/indexing/api/get-index-state';
import { matterJobsQueryKey } from '@/features/jobs/api/get-matter-jobs';
import { documentsQueryKey } from './get-documents';

/** Queues a failed document for extraction again (202 with the document and the job). */
export function retryDocument(matterId: number, docId: number): Promise<RetryDocumentResponse> {
  return api.post<RetryDocumentResponse>(`/api/matters/${matterId}/documents/${docId}/retry`);
}

export function useRetryDocument(matterId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (docId: number) => retryDocument(matterId, docId),
    onSettled: async () => {
      await Promise.all([
        queryClient.invalidateQueries({ queryKey: documentsQueryKey(matterId) }),
        queryClient.invalidateQueries({ queryKey: matterJobsQueryKey(matterId) }),
        queryClient.invalidateQueries({ queryKey: indexStateQueryKey(matterId) }),
      ]);
    },
  });
}
