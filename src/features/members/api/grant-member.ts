import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { GrantMemberReq, MemberResponse } from '@shared/schemas/members';
import { api } from '@/lib/api-client';
import { matterQueryOptions } from '@/features/matters/api/get-matter';
import { membersQueryOptions } from './get-members';

/** Gives an existing account a role on the matter at once (no e-mail round trip). */
export function grantMember(matterId: number, input: GrantMemberReq): Promise<MemberResponse> {
  return api.post<MemberResponse>(`/api/matters/${matterId}/members`, input);
}

export function useGrantMember(matterId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: GrantMemberReq) => grantMember(matterId, input),
    onSuccess: async () => {
      await queryClient.invalidateQueries({ queryKey: membersQueryOptions(matterId).queryKey });
      await queryClient.invalidateQueries({
        queryKey: matterQueryOptions(matterId).queryKey,
        exact: true,
      });
    },
  });
}
