import { queryOptions, useQuery } from '@tanstack/react-query';
import type { AdminMattersResponse } from '@shared/schemas/admin';
import { api } from '@/lib/api-client';

export type { AdminMatter } from '@shared/schemas/admin';

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
