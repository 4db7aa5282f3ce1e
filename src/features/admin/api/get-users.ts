import { queryOptions, useQuery } from '@tanstack/react-query';
import type { AdminUsersResponse } from '@shared/schemas/admin';
import { api } from '@/lib/api-client';

export type { AdminUser } from '@shared/schemas/admin';

export function getUsers(signal?: AbortSignal): Promise<AdminUsersResponse> {
  return api.get<AdminUsersResponse>('/api/admin/users', { signal });
}

export function usersQueryOptions() {
  return queryOptions({
    queryKey: ['admin', 'users'],
    queryFn: ({ signal }) => getUsers(signal),
  });
}

export function useUsers() {
  return useQuery(usersQueryOptions());
}
