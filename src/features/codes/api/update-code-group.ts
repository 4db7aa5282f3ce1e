import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { CodeGroupResponse, UpdateCodeGroupReq } from '@shared/schemas/codes';
import { api } from '@/lib/api-client';
import { codesQueryKey } from './get-codes';

/** PATCH /api/matters/:matterId/code-groups/:groupId (codes.manage). */
export function updateCodeGroup(matterId: number, groupId: number, body: UpdateCodeGroupReq) {
  return api.patch<CodeGroupResponse>(`/api/matters/${matterId}/code-groups/${groupId}`, body);
}

export function useUpdateCodeGroup(matterId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ groupId, changes }: { groupId: number; changes: UpdateCodeGroupReq }) =>
      updateCodeGroup(matterId, groupId, changes),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: codesQueryKey(matterId) }),
  });
}
