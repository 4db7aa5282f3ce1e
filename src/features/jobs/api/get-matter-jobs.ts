import { queryOptions, useQuery } from '@tanstack/react-query';
import type { Job, JobKind, JobsResponse } from '@shared/schemas/jobs';
import { api } from '@/lib/api-client';

export type { Job, JobKind, JobStatus, JobsResponse } from '@shared/schemas/jobs';

export interface MatterJobsFilters {
  /** Only queued or running jobs. */
  active?: boolean;
  kind?: JobKind;
  limit?: number;
}

/** The matter's background jobs, newest first. */
export function getMatterJobs(
  matterId: number,
  filters: MatterJobsFilters = {},
  signal?: AbortSignal,
): Promise<JobsResponse> {
  return api.get<JobsResponse>(`/api/matters/${matterId}/jobs`, {
    signal,
    query: {
      active: filters.active === undefined ? undefined : filters.active ? '1' : '0',
      kind: filters.kind,
      limit: filters.limit,
    },
  });
}

export function isJobActive(job: Pick<Job, 'status'>): boolean {
  return job.status === 'queued' || job.status === 'running';
}

export const matterJobsQueryKey = (matterId: number) =>
  ['matters', 'detail', matterId, 'jobs'] as const;

export function matterJobsQueryOptions(matterId: number, filters: MatterJobsFilters = {}) {
  return queryOptions({
    queryKey: [...matterJobsQueryKey(matterId), filters],
    queryFn: ({ signal }) => getMatterJobs(matterId, filters, signal),
    staleTime: 0,
    // Poll only while something runs; a settled list stays quiet.
    refetchInterval: (query) => (query.state.data?.jobs.some(isJobActive) ? 1_000 : false),
  });
}

export function useMatterJobs(matterId: number, filters: MatterJobsFilters = {}) {
  return useQuery(matterJobsQueryOptions(matterId, filters));
}
