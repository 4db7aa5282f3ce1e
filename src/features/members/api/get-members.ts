import { queryOptions, useQuery } from '@tanstack/react-query';
import type { MembersResponse } from '@shared/schemas/members';
import { api } from '@/lib/api-client';

export type { Member, MembersResponse, PendingInvitation } from '@shared/schemas/members';

/** Members and pending invitations of a matter (lead only). */
export function getMembers(matterId: number, signal?: AbortSignal): Promise<MembersResponse> {
  return api.get<MembersResponse>(`/api/matters/${matterId}/members`, { signal });
}

export function membersQueryOptions(matterId: number) {
  return queryOptions({
    queryKey: ['matters', 'detail', matterId, 'members'],
    queryFn: ({ signal }) => getMembers(matterId, signal),
  });
}

export function useMembers(matterId: number) {
  return useQuery(membersQueryOptions(matterId));
}
