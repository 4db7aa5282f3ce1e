import { queryOptions, useQuery } from '@tanstack/react-query';
import type { TeamProgressResponse } from '@shared/schemas/batches';
import { api } from '@/lib/api-client';
import { batchesQueryKey } from './keys';

/** GET /api/matters/:matterId/batches/progress (leads and attorneys). */
export function getTeamProgress(matterId: number, signal?: AbortSignal) {
  return api.get<TeamProgressResponse>(`/api/matters/${matterId}/batches/progress`, { signal });
}

export function teamProgressQueryOptions(matterId: number) {
  return queryOptions({
    queryKey: [...batchesQueryKey(matterId), 'progress'],
    queryFn: ({ signal }) => getTeamProgress(matterId, signal),
  });
}

export function useTeamProgress(matterId: number, enabled: boolean) {
  return useQuery({ ...teamProgressQueryOptions(matterId), enabled });
}
