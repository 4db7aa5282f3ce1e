import { queryOptions, useQuery } from '@tanstack/react-query';
import type { MatterRole } from '../../../../shared/roles';
import { api } from '../../../lib/api-client';

export interface PendingInvitation {
  id: number;
  email: string;
  role: MatterRole;
  invitedBy: string;
  createdAt: string;
  expiresAt: string;
}

export interface InvitationsResponse {
  invitations: PendingInvitation[];
}

export function getInvitations(
  matterId: number,
  signal?: AbortSignal,
): Promise<InvitationsResponse> {
  return api.get<InvitationsResponse>(`/api/matters/${matterId}/invitations`, { signal });
}

export function invitationsQueryOptions(matterId: number) {
  return queryOptions({
    queryKey: ['matters', 'detail', matterId, 'invitations'],
    queryFn: ({ signal }) => getInvitations(matterId, signal),
  });
}

export function useInvitations(matterId: number) {
  return useQuery(invitationsQueryOptions(matterId));
}
