import { matterParams } from '../../shared/schemas/common';
import {
  createSampleSchema,
  sampleParams,
  type CreateSampleResponse,
  type SampleResponse,
  type SamplesResponse,
} from '../../shared/schemas/validation';
import { z } from 'zod';
import { sendCsv, toCsv } from '../exports/csv';
import { defineRoute } from '../http/route';
import { createSample, getSample, recordReportViewed, sampleReportCsv, samplesOf } from './service';

const sampleQuery = z.object({
  /** The printable report records that it was viewed. */
  report: z.enum(['1'], { error: 'must be 1' }).optional(),
});

export const validationRoutes = [
  defineRoute({
    method: 'post',
    path: '/matters/:matterId/validation/samples',
    access: { matter: 'validation.run' },
    schemas: { params: matterParams, body: createSampleSchema },
    status: 201,
    summary: 'Draw a prevalence or elusion sample (seeded simple random sample); audited',
    handler: ({ ctx, matter, body, user, ip }): Promise<CreateSampleResponse> =>
      createSample(ctx, matter.matterId, body, { id: user.id, email: user.email, ip }),
  }),
  defineRoute({
    method: 'get',
    path: '/matters/:matterId/validation/samples',
    access: { matter: 'validation.view' },
    schemas: { params: matterParams },
    summary: "The matter's validation samples, newest first",
    handler: ({ ctx, matter }): Promise<SamplesResponse> => samplesOf(ctx, matter.matterId),
  }),
  defineRoute({
    method: 'get',
    path: '/matters/:matterId/validation/samples/:sampleId',
    access: { matter: 'validation.view' },
    schemas: { params: sampleParams, query: sampleQuery },
    summary: 'A sample with its coded share, rate, Clopper-Pearson and Wilson intervals, recall',
    handler: async ({ ctx, matter, params, query, user, ip }): Promise<SampleResponse> => {
      if (query.report)
        await recordReportViewed(ctx, matter.matterId, params.sampleId, {
          id: user.id,
          email: user.email,
          ip,
        });
      const { listing: _listing, ...sample } = await getSample(
        ctx,
        matter.matterId,
        params.sampleId,
      );
      return sample;
    },
  }),
  defineRoute({
    method: 'get',
    path: '/matters/:matterId/validation/samples/:sampleId/report.csv',
    access: { matter: 'validation.view' },
    schemas: { params: sampleParams },
    summary: "A sample's report as CSV (figures, then each sampled document); audited",
    handler: async ({ ctx, matter, params, res, user, ip }) => {
      const csv = await sampleReportCsv(ctx, matter.matterId, params.sampleId, {
        id: user.id,
        email: user.email,
        ip,
      });
      sendCsv(res, csv.filename, toCsv(csv.header, csv.rows));
    },
  }),
];
