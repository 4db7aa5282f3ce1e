import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { CreateInvitationReq, CreateInvitationResponse } from '@shared/schemas/invitations';
import { api } from '@/lib/api-client';
import { membersQueryOptions } from './get-members';

/** E-mails a single-use link; the invitation then shows as pending. */
export function inviteMember(
  matterId: number,
  input: CreateInvitationReq,
): Promise<CreateInvitationResponse> {
  return api.post<CreateInvitationResponse>(`/api/matters/${matterId}/invitations`, input);
}

export function useInviteMember(matterId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: CreateInvitationReq) => inviteMember(matterId, input),
    onSuccess: () =>
      queryClient.invalidateQueries({ queryKey: membersQueryOptions(matterId).queryKey }),
  });
}
