import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';

/** A new account (name + password) or the password of the existing account to link. */
export type AcceptInvitationInput =
  { mode: 'create'; name: string; password: string } | { mode: 'link'; password: string };

export interface AcceptInvitationResponse {
  matterId: number;
}

export function acceptInvitation(
  token: string,
  input: AcceptInvitationInput,
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
    mutationFn: (input: AcceptInvitationInput) => acceptInvitation(token, input),
    onSuccess: () => queryClient.clear(),
  });
}
