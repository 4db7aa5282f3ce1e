import { matterParams } from '../../shared/schemas/common';
import { resultsExportQuerySchema } from '../../shared/schemas/exports';
import { defineRoute } from '../http/route';
import { sendCsv } from './csv';
import {
  privilegeLogParams,
  privilegeLogPatchSchema,
  type PrivilegeLogResponse,
} from '../../shared/schemas/privilege-log';
import { buildPrivilegeLog, patchPrivilegeLogRow } from './privilege-log';
import { exportPrivilegeLog, exportResults } from './service';

export const exportRoutes = [
  defineRoute({
    method: 'get',
    path: '/matters/:matterId/exports/results.csv',
    access: { matter: 'exports.create' },
    schemas: { params: matterParams, query: resultsExportQuerySchema },
    summary: "A search's whole result set as CSV (RFC 4180, UTF-8 with BOM); audited",
    handler: async ({ ctx, matter, query, res, user, ip }) => {
      const csv = await exportResults(ctx, matter.matterId, query, {
        id: user.id,
        email: user.email,
        ip,
      });
      sendCsv(res, csv.filename, csv.body);
    },
  }),
  defineRoute({
    method: 'get',
    path: '/matters/:matterId/exports/privilege-log.csv',
    access: { matter: 'exports.create' },
    schemas: { params: matterParams },
    summary: 'Privilege log of documents coded with a privilege code, as CSV; audited',
    handler: async ({ ctx, matter, res, user, ip }) => {
      const csv = await exportPrivilegeLog(ctx, matter.matterId, {
        id: user.id,
        email: user.email,
        ip,
      });
      sendCsv(res, csv.filename, csv.body);
    },
  }),
  defineRoute({
    method: 'get',
    path: '/matters/:matterId/privilege-log',
    access: { matter: 'privilege_log.edit' },
    schemas: { params: matterParams },
    summary: 'The privilege log rows (family members under their parent)',
    handler: async ({ ctx, matter }): Promise<PrivilegeLogResponse> => ({
      rows: await buildPrivilegeLog(ctx.db, matter.matterId),
    }),
  }),
  defineRoute({
    method: 'patch',
    path: '/matters/:matterId/privilege-log/:docId',
    access: { matter: 'privilege_log.edit' },
    schemas: { params: privilegeLogParams, body: privilegeLogPatchSchema },
    summary: "Edit a privilege log row's description, basis, type or treatment",
    handler: ({ ctx, matter, params, body, user, ip }) =>
      patchPrivilegeLogRow(ctx.db, matter.matterId, params.docId, body, {
        id: user.id,
        email: user.email,
        ip,
      }),
  }),
];
