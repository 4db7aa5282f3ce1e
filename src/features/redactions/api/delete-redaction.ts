import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { redactionKeys } from '../keys';

/** DELETE .../documents/:docId/redactions/:redactionId (refused once produced). */
export function deleteRedaction(matterId: number, documentId: number, redactionId: number) {
  return api.delete<void>(
    `/api/matters/${matterId}/documents/${documentId}/redactions/${redactionId}`,
  );
}

export function useDeleteRedaction(matterId: number, documentId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (redactionId: number) => deleteRedaction(matterId, documentId, redactionId),
    onSuccess: () =>
      queryClient.invalidateQueries({ queryKey: redactionKeys.document(matterId, documentId) }),
  });
}
