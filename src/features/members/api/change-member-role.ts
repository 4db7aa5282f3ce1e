import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { MatterRole } from '../../../../shared/roles';
import { api } from '../../../lib/api-client';
import { membersQueryOptions } from './get-members';

export interface ChangeMemberRoleInput {
  userId: string;
  role: MatterRole;
}

export function changeMemberRole(matterId: number, input: ChangeMemberRoleInput): Promise<unknown> {
  return api.patch(`/api/matters/${matterId}/members`, input);
}

export function useChangeMemberRole(matterId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: ChangeMemberRoleInput) => changeMemberRole(matterId, input),
    onSuccess: () =>
      queryClient.invalidateQueries({ queryKey: membersQueryOptions(matterId).queryKey }),
  });
}
