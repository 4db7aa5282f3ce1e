import { auditExportQuerySchema, auditQuerySchema } from '../../shared/schemas/audit';
import { matterParams } from '../../shared/schemas/common';
import { defineRoute } from '../http/route';
import { sendCsv } from '../exports/csv';
import { exportAuditCsv, readAuditPage } from './service';

export const auditRoutes = [
  defineRoute({
    method: 'get',
    path: '/matters/:matterId/audit',
    access: { matter: 'audit.read' },
    schemas: { params: matterParams, query: auditQuerySchema },
    summary: "The matter's audit log, newest first",
    handler: ({ ctx, matter, query }) => readAuditPage(ctx.db, matter.matterId, query),
  }),
  defineRoute({
    method: 'get',
    path: '/matters/:matterId/audit.csv',
    access: { matter: 'audit.read' },
    schemas: { params: matterParams, query: auditExportQuerySchema },
    summary: "The matter's audit trail as CSV, optionally of a day range (from, to); audited",
    handler: async ({ ctx, matter, query, res, user, ip }) => {
      const csv = await exportAuditCsv(ctx.db, matter.matterId, query, {
        id: user.id,
        email: user.email,
        ip,
      });
      sendCsv(res, csv.filename, csv.body);
    },
  }),
];
