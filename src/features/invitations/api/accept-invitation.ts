import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { AcceptInvitationReq, AcceptInvitationResponse } from '@shared/schemas/invitations';
import { api } from '@/lib/api-client';
import { invitationQueryOptions } from './get-invitation';

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
    // The session changed hands: nothing cached for a previous person may show. This
    // link's preview stays, though: the page keeps showing it until the navigation to the
    // matter commits. Clearing it too made the page unmount mid-navigation, taking with it
    // the last observer of the new session's fetch, which TanStack Query then cancels (a
    // query that consumed its AbortSignal is aborted when its last observer leaves): the
    // signed-in loader awaiting that fetch failed with CancelledError.
    onSuccess: () =>
      queryClient.removeQueries({
        predicate: (query) =>
          !(
            query.queryKey[0] === invitationQueryOptions(token).queryKey[0] &&
            query.queryKey[1] === token
          ),
      }),
  });
}
