import { queryOptions, useQuery } from '@tanstack/react-query';
import type { JobResponse } from '@shared/schemas/jobs';
import { api } from '@/lib/api-client';
import { isJobActive } from './get-matter-jobs';

/** One job's progress (GET /api/jobs/:jobId). */
export function getJob(jobId: number, signal?: AbortSignal): Promise<JobResponse> {
  return api.get<JobResponse>(`/api/jobs/${jobId}`, { signal });
}

export function jobQueryOptions(jobId: number) {
  return queryOptions({
    queryKey: ['jobs', jobId],
    queryFn: ({ signal }) => getJob(jobId, signal),
    staleTime: 0,
    // Poll once a second while the job is queued or running; stop when it settles.
    refetchInterval: (query) => {
      const job = query.state.data?.job;
      return !job || isJobActive(job) ? 1_000 : false;
    },
  });
}

export function useJob(jobId: number | null) {
  return useQuery({ ...jobQueryOptions(jobId ?? 0), enabled: jobId != null });
}
