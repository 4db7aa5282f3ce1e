import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { CodeGroupResponse, CreateCodeGroupReq } from '@shared/schemas/codes';
import { api } from '@/lib/api-client';
import { codesQueryKey } from './get-codes';

/** POST /api/matters/:matterId/code-groups (codes.manage). */
export function createCodeGroup(matterId: number, body: CreateCodeGroupReq) {
  return api.post<CodeGroupResponse>(`/api/matters/${matterId}/code-groups`, body);
}

export function useCreateCodeGroup(matterId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: CreateCodeGroupReq) => createCodeGroup(matterId, body),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: codesQueryKey(matterId) }),
  });
}
