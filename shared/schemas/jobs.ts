import { z } from 'zod';
import { idSchema } from './common';

// Background jobs (server/jobs): one row per job in the jobs table, polled by the client
// for progress bars.

export const JOB_KINDS = [
  'extract-batch',
  'build-index',
  'build-production',
  'concept-grouping',
] as const;
export type JobKind = (typeof JOB_KINDS)[number];

export const JOB_STATUSES = ['queued', 'running', 'succeeded', 'failed', 'cancelled'] as const;
export type JobStatus = (typeof JOB_STATUSES)[number];

export const jobParams = z.object({ jobId: idSchema });
export type JobParams = z.infer<typeof jobParams>;

/** GET /api/matters/:matterId/jobs?active=1&limit=20 */
export const jobsQuerySchema = z.object({
  /** Only queued or running jobs. */
  active: z
    .enum(['0', '1', 'true', 'false'], { error: 'must be 0 or 1' })
    .transform((v) => v === '1' || v === 'true')
    .optional(),
  kind: z.enum(JOB_KINDS, { error: `must be one of ${JOB_KINDS.join(', ')}` }).optional(),
  limit: z.coerce
    .number({ error: 'must be a number' })
    .int('must be a whole number')
    .min(1, 'must be at least 1')
    .max(100, 'must be at most 100')
    .default(20),
});
export type JobsQueryReq = z.infer<typeof jobsQuerySchema>;

export interface Job {
  id: number;
  matterId: number | null;
  kind: JobKind;
  status: JobStatus;
  /** Units done out of `total` (files for extract-batch; percent for build-index). */
  progress: number;
  total: number;
  /** What the job is doing now, e.g. "Extracting 12 of 40: memo.pdf". */
  message: string;
  /** Why it failed (status 'failed'). */
  error: string | null;
  createdAt: string;
  startedAt: string | null;
  finishedAt: string | null;
}

/** GET /api/jobs/:jobId */
export interface JobResponse {
  job: Job;
}

/** GET /api/matters/:matterId/jobs: newest first. */
export interface JobsResponse {
  jobs: Job[];
}
