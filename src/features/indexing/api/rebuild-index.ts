import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { RebuildIndexReq, RebuildIndexResponse } from '@shared/schemas/indexing';
import { api } from '@/lib/api-client';
import { matterJobsQueryKey } from '@/features/jobs/api/get-matter-jobs';
import { indexStateQueryKey } from './get-index-state';

/** Queues a full rebuild of the concept space (202 with the job); the old version serves until it is done. */
export function rebuildIndex(
  matterId: number,
  input: RebuildIndexReq = {},
): Promise<RebuildIndexResponse> {
  return api.post<RebuildIndexResponse>(`/api/matters/${matterId}/index/rebuild`, input);
}

export function useRebuildIndex(matterId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: RebuildIndexReq = {}) => rebuildIndex(matterId, input),
    onSettled: async () => {
      await Promise.all([
        queryClient.invalidateQueries({ queryKey: indexStateQueryKey(matterId) }),
        queryClient.invalidateQueries({ queryKey: matterJobsQueryKey(matterId) }),
      ]);
    },
  });
}
