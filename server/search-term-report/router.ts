import { matterParams } from '../../shared/schemas/common';
import {
  termReportRequestSchema,
  type TermReportResponse,
} from '../../shared/schemas/search-term-report';
import { sendCsv } from '../exports/csv';
import { defineRoute } from '../http/route';
import { exportTermReport, runTermReport } from './service';

export const searchTermReportRoutes = [
  defineRoute({
    method: 'post',
    path: '/matters/:matterId/search-term-report',
    access: { matter: 'search.run' },
    schemas: { params: matterParams, body: termReportRequestSchema },
    summary: 'Hits per search term (unique, with families, per custodian); audited',
    handler: ({ ctx, matter, body, user, ip }): Promise<TermReportResponse> =>
      runTermReport(ctx, matter.matterId, body, { id: user.id, email: user.email, ip }),
  }),
  defineRoute({
    method: 'post',
    path: '/matters/:matterId/search-term-report.csv',
    access: { matter: 'exports.create' },
    schemas: { params: matterParams, body: termReportRequestSchema },
    summary: 'The search term report as CSV (RFC 4180, UTF-8 with BOM); audited as an export',
    handler: async ({ ctx, matter, body, res, user, ip }) => {
      const csv = await exportTermReport(ctx, matter.matterId, body, {
        id: user.id,
        email: user.email,
        ip,
      });
      sendCsv(res, csv.filename, csv.body);
    },
  }),
];
