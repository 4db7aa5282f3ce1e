import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { ChangeRoleReq, MemberResponse } from '@shared/schemas/members';
import { api } from '@/lib/api-client';
import { membersQueryOptions } from './get-members';

export interface ChangeMemberRoleInput extends ChangeRoleReq {
  userId: string;
}

export function changeMemberRole(
  matterId: number,
  { userId, role }: ChangeMemberRoleInput,
): Promise<MemberResponse> {
  return api.patch<MemberResponse>(
    `/api/matters/${matterId}/members/${encodeURIComponent(userId)}`,
    { role },
  );
}

export function useChangeMemberRole(matterId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: ChangeMemberRoleInput) => changeMemberRole(matterId, input),
    onSuccess: () =>
      queryClient.invalidateQueries({ queryKey: membersQueryOptions(matterId).queryKey }),
  });
}
