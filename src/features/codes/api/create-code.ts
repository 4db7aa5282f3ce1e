import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { CodeResponse, CreateCodeReq } from '@shared/schemas/codes';
import { api } from '@/lib/api-client';
import { codesQueryKey } from './get-codes';

/** POST /api/matters/:matterId/codes (codes.manage). */
export function createCode(matterId: number, body: CreateCodeReq): Promise<CodeResponse> {
  return api.post<CodeResponse>(`/api/matters/${matterId}/codes`, body);
}

export function useCreateCode(matterId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: CreateCodeReq) => createCode(matterId, body),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: codesQueryKey(matterId) }),
  });
}
