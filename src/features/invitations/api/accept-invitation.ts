import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { AcceptInvitationReq, AcceptInvitationResponse } from '@shared/schemas/invitations';
import { api } from '@/lib/api-client';

/**
 * Accepts with a new account (name + password) or an existing one (its password, or
 * nothing when already signed in as it). Success signs the browser in as that account.
 */
export function acceptInvitation(
  token: string,
  input: AcceptInvitationReq,
): Promise<AcceptInvitationResponse> {
  return api.post<AcceptInvitationResponse>(
    `/api/invitations/${encodeURIComponent(token)}/accept`,
    input,
    {
      allowUnauthenticated: true,
    },
  );
}

export function useAcceptInvitation(token: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: AcceptInvitationReq) => acceptInvitation(token, input),
    // The session changed hands: nothing cached for a previous person may show.
    onSuccess: () => queryClient.clear(),
  });
}
