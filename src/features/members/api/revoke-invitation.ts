import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { membersQueryOptions } from './get-members';

export function revokeInvitation(matterId: number, invitationId: number): Promise<void> {
  return api.delete<void>(`/api/matters/${matterId}/invitations/${invitationId}`);
}

export function useRevokeInvitation(matterId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (invitationId: number) => revokeInvitation(matterId, invitationId),
    onSuccess: () =>
      queryClient.invalidateQueries({ queryKey: membersQueryOptions(matterId).queryKey }),
  });
}
