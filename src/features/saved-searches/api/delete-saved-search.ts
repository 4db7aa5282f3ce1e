import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { savedSearchesQueryKey } from './get-saved-searches';

/** DELETE /api/matters/:matterId/saved-searches/:savedSearchId */
export function deleteSavedSearch(matterId: number, savedSearchId: number): Promise<void> {
  return api.delete<void>(`/api/matters/${matterId}/saved-searches/${savedSearchId}`);
}

export function useDeleteSavedSearch(matterId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (savedSearchId: number) => deleteSavedSearch(matterId, savedSearchId),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: savedSearchesQueryKey(matterId) }),
  });
}
