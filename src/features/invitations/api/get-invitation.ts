import { queryOptions, useQuery } from '@tanstack/react-query';
import type { MatterRole } from '../../../../shared/roles';
import { api } from '../../../lib/api-client';

/** What the invitation link may show before it is accepted. */
export interface InvitationPreview {
  email: string;
  role: MatterRole;
  matterName: string;
  invitedByName: string;
  expiresAt: string;
  /** Whether an account with this e-mail already exists (then: sign in to link it). */
  accountExists: boolean;
}

export interface InvitationPreviewResponse {
  invitation: InvitationPreview;
}

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
  });
}

export function useInvitation(token: string) {
  return useQuery(invitationQueryOptions(token));
}
