import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';

export interface AdminMatter {
  id: number;
  name: string;
  description: string;
  controlPrefix: string;
  createdAt: string;
  leads: { userId: string; name: string; email: string }[];
  memberCount: number;
}

export interface AdminMattersResponse {
  matters: AdminMatter[];
}

export function getAdminMatters(signal?: AbortSignal): Promise<AdminMattersResponse> {
  return api.get<AdminMattersResponse>('/api/admin/matters', { signal });
}

export function adminMattersQueryOptions() {
  return queryOptions({
    queryKey: ['admin', 'matters'],
    queryFn: ({ signal }) => getAdminMatters(signal),
  });
}

export function useAdminMatters() {
  return useQuery(adminMattersQueryOptions());
}
