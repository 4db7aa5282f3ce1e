import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { MatterRole } from '../../../../shared/roles';
import { api } from '../../../lib/api-client';
import { membersQueryOptions } from './get-members';

export interface GrantMemberInput {
  email: string;
  role: MatterRole;
}

/** Gives an existing account a role on the matter. */
export function grantMember(matterId: number, input: GrantMemberInput): Promise<unknown> {
  return api.post(`/api/matters/${matterId}/members`, input);
}

export function useGrantMember(matterId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: GrantMemberInput) => grantMember(matterId, input),
    onSuccess: () =>
      queryClient.invalidateQueries({ queryKey: membersQueryOptions(matterId).queryKey }),
  });
}
