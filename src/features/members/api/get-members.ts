import { queryOptions, useQuery } from '@tanstack/react-query';
import type { MatterRole } from '../../../../shared/roles';
import { api } from '../../../lib/api-client';

export interface Member {
  userId: string;
  email: string;
  name: string;
  role: MatterRole;
  grantedAt: string;
  grantedBy: string | null;
}

export interface MembersResponse {
  members: Member[];
}

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
