import { useMutation, useQueryClient } from '@tanstack/react-query';
import type {
  CreateGroupingReq,
  CreateGroupingResponse,
  GroupingResponse,
} from '@shared/schemas/concepts';
import { api } from '@/lib/api-client';
import { getJob } from '@/features/jobs/api/get-job';
import { isJobActive } from '@/features/jobs/api/get-matter-jobs';
import { groupingQueryOptions } from './get-grouping';
import { groupingsQueryKey } from './get-groupings';
import { conceptsPath } from './keys';

const POLL_MS = 1_000;
const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));

/**
 * POST .../concepts/groupings: k-means over the document vectors (the same settings give
 * the same stored grouping). A new grouping is computed by a background job: this polls
 * the job until it settles, then asks again for the stored grouping.
 */
export async function createGrouping(
  matterId: number,
  body: CreateGroupingReq,
): Promise<GroupingResponse> {
  // A version switch while the job ran can ask for one more job; never loop for ever.
  for (let attempt = 0; attempt < 3; attempt++) {
    const answer = await api.post<CreateGroupingResponse>(
      conceptsPath(matterId, 'groupings'),
      body,
    );
    if (!('job' in answer)) return answer;
    let job = answer.job;
    while (isJobActive(job)) {
      await sleep(POLL_MS);
      job = (await getJob(job.id)).job;
    }
    if (job.status !== 'succeeded')
      throw new Error(job.error ?? 'The grouping could not be computed.');
  }
  throw new Error('The grouping could not be computed: the concept index kept changing.');
}

export function useCreateGrouping(matterId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: CreateGroupingReq) => createGrouping(matterId, body),
    onSuccess: async (result) => {
      queryClient.setQueryData(groupingQueryOptions(matterId, result.grouping.id).queryKey, result);
      await queryClient.invalidateQueries({ queryKey: [...groupingsQueryKey(matterId), 'list'] });
    },
  });
}
