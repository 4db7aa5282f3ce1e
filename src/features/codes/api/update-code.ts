import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { CodeResponse, UpdateCodeReq } from '@shared/schemas/codes';
import { api } from '@/lib/api-client';
import { codesQueryKey } from './get-codes';

/** PATCH /api/matters/:matterId/codes/:codeId (codes.manage): rename, re-key, archive, restore. */
export function updateCode(
  matterId: number,
  codeId: number,
  body: UpdateCodeReq,
): Promise<CodeResponse> {
  return api.patch<CodeResponse>(`/api/matters/${matterId}/codes/${codeId}`, body);
}

export function useUpdateCode(matterId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ codeId, changes }: { codeId: number; changes: UpdateCodeReq }) =>
      updateCode(matterId, codeId, changes),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: codesQueryKey(matterId) }),
  });
}
