import { matterParams } from '../../shared/schemas/common';
import {
  jobParams,
  jobsQuerySchema,
  type JobResponse,
  type JobsResponse,
} from '../../shared/schemas/jobs';
import { defineRoute } from '../http/route';
import { notFound } from '../http/errors';
import { jobRowToApi } from './map';
import { findJob, listMatterJobs } from './queries';

export const jobRoutes = [
  defineRoute({
    method: 'get',
    path: '/jobs/:jobId',
    access: { matter: 'documents.read', via: 'job' },
    schemas: { params: jobParams },
    summary: "A job's status and progress (for members of its matter)",
    handler: async ({ ctx, params }): Promise<JobResponse> => {
      const row = await findJob(ctx.db, params.jobId);
      if (!row) throw notFound('Job');
      return { job: jobRowToApi(row) };
    },
  }),
  defineRoute({
    method: 'get',
    path: '/matters/:matterId/jobs',
    access: { matter: 'documents.read' },
    schemas: { params: matterParams, query: jobsQuerySchema },
    summary: "The matter's recent jobs, newest first (progress bars)",
    handler: async ({ ctx, matter, query }): Promise<JobsResponse> => ({
      jobs: (await listMatterJobs(ctx.db, matter.matterId, query)).map(jobRowToApi),
    }),
  }),
];
