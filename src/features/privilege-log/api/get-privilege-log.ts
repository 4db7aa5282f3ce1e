import { queryOptions, useQuery } from '@tanstack/react-query';
import type { PrivilegeLogResponse } from '@shared/schemas/privilege-log';
import { api } from '@/lib/api-client';

export const privilegeLogQueryKey = (matterId: number) =>
  ['matters', 'detail', matterId, 'privilege-log'] as const;

/** GET /api/matters/:matterId/privilege-log (leads and attorneys). */
export function getPrivilegeLog(matterId: number, signal?: AbortSignal) {
  return api.get<PrivilegeLogResponse>(`/api/matters/${matterId}/privilege-log`, { signal });
}

export function privilegeLogQueryOptions(matterId: number) {
  return queryOptions({
    queryKey: privilegeLogQueryKey(matterId),
    queryFn: ({ signal }) => getPrivilegeLog(matterId, signal),
  });
}

export function usePrivilegeLog(matterId: number) {
  return useQuery(privilegeLogQueryOptions(matterId));
}
