import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { CreateSavedSearchReq, SavedSearchResponse } from '@shared/schemas/saved-searches';
import { api } from '@/lib/api-client';
import { savedSearchesQueryKey } from './get-saved-searches';

/** POST /api/matters/:matterId/saved-searches (searches.save). */
export function createSavedSearch(
  matterId: number,
  body: CreateSavedSearchReq,
): Promise<SavedSearchResponse> {
  return api.post<SavedSearchResponse>(`/api/matters/${matterId}/saved-searches`, body);
}

export function useCreateSavedSearch(matterId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: CreateSavedSearchReq) => createSavedSearch(matterId, body),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: savedSearchesQueryKey(matterId) }),
  });
}
