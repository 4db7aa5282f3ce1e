import { auditQuerySchema } from '../../shared/schemas/audit';
import { matterParams } from '../../shared/schemas/common';
import { defineRoute } from '../http/route';
import { readAuditPage } from './service';

export const auditRoutes = [
  defineRoute({
    method: 'get',
    path: '/matters/:matterId/audit',
    access: { matter: 'audit.read' },
    schemas: { params: matterParams, query: auditQuerySchema },
    summary: "The matter's audit log, newest first",
    handler: ({ ctx, matter, query }) => readAuditPage(ctx.db, matter.matterId, query),
  }),
];
