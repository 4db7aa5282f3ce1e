import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { reviewsQueryKey } from '@/features/review/api/keys';

/** DELETE /api/matters/:matterId/documents/:docId/lock (the lead): recoding allowed again. */
export function unlockDocument(matterId: number, docId: number) {
  return api.delete<void>(`/api/matters/${matterId}/documents/${docId}/lock`);
}

export function useUnlockDocument(matterId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (docId: number) => unlockDocument(matterId, docId),
    onSettled: () => queryClient.invalidateQueries({ queryKey: reviewsQueryKey(matterId) }),
  });
}
