import { useMutation, useQueryClient } from '@tanstack/react-query';
import type {
  PrivilegeEntryReq,
  PrivilegeEntryResponse,
  ReviewResponse,
} from '@shared/schemas/review';
import { api } from '@/lib/api-client';
import { reviewsQueryKey } from './keys';

/** PUT /api/matters/:matterId/documents/:docId/privilege: basis and description for the log. */
export function savePrivilege(
  matterId: number,
  docId: number,
  body: PrivilegeEntryReq,
): Promise<PrivilegeEntryResponse> {
  return api.put<PrivilegeEntryResponse>(
    `/api/matters/${matterId}/documents/${docId}/privilege`,
    body,
  );
}

export function useSavePrivilege(matterId: number, docId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: PrivilegeEntryReq) => savePrivilege(matterId, docId, body),
    onSuccess: ({ privilege }) =>
      queryClient.setQueriesData<ReviewResponse>(
        { queryKey: [...reviewsQueryKey(matterId), docId] },
        (old) => (old ? { ...old, privilege } : old),
      ),
  });
}
