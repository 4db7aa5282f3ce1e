import { queryOptions, useQuery } from '@tanstack/react-query';
import type { InvitationPreviewResponse } from '@shared/schemas/invitations';
import { api } from '@/lib/api-client';

export type { InvitationPreviewResponse } from '@shared/schemas/invitations';

/** What the link may show before it is accepted (public: the token is the credential). */
export function getInvitation(
  token: string,
  signal?: AbortSignal,
): Promise<InvitationPreviewResponse> {
  return api.get<InvitationPreviewResponse>(`/api/invitations/${encodeURIComponent(token)}`, {
    signal,
    allowUnauthenticated: true,
  });
}

export function invitationQueryOptions(token: string) {
  return queryOptions({
    queryKey: ['invitations', token],
    queryFn: ({ signal }) => getInvitation(token, signal),
    staleTime: 0,
  });
}

export function useInvitation(token: string) {
  return useQuery(invitationQueryOptions(token));
}
