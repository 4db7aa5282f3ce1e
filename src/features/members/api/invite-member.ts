import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { MatterRole } from '../../../../shared/roles';
import { api } from '../../../lib/api-client';
import { invitationsQueryOptions } from './get-invitations';

export interface InviteMemberInput {
  email: string;
  role: MatterRole;
}

/** Sends an invitation e-mail with a single-use link. */
export function inviteMember(matterId: number, input: InviteMemberInput): Promise<unknown> {
  return api.post(`/api/matters/${matterId}/invitations`, input);
}

export function useInviteMember(matterId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: InviteMemberInput) => inviteMember(matterId, input),
    onSuccess: () =>
      queryClient.invalidateQueries({ queryKey: invitationsQueryOptions(matterId).queryKey }),
  });
}
