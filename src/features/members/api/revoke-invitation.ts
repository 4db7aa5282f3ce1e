import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { invitationsQueryOptions } from './get-invitations';

export function revokeInvitation(matterId: number, invitationId: number): Promise<unknown> {
  return api.delete(`/api/matters/${matterId}/invitations/${invitationId}`);
}

export function useRevokeInvitation(matterId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (invitationId: number) => revokeInvitation(matterId, invitationId),
    onSuccess: () =>
      queryClient.invalidateQueries({ queryKey: invitationsQueryOptions(matterId).queryKey }),
  });
}
