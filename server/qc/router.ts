import { matterParams } from '../../shared/schemas/common';
import { documentParams } from '../../shared/schemas/documents';
import {
  createQcSampleSchema,
  qcDecisionSchema,
  qcItemParams,
  qcSampleParams,
  type OverturnRatesResponse,
  type QcSampleResponse,
  type QcSamplesResponse,
} from '../../shared/schemas/qc';
import { defineRoute } from '../http/route';
import {
  decideQcItem,
  drawQcSample,
  listQcSamples,
  readOverturnRates,
  readQcSample,
  unlockDocument,
} from './service';

const actorOf = (user: { id: string; email: string }, ip: string | null) => ({
  id: user.id,
  email: user.email,
  ip,
});

export const qcRoutes = [
  defineRoute({
    method: 'post',
    path: '/matters/:matterId/qc/samples',
    access: { matter: 'qc.manage' },
    schemas: { params: matterParams, body: createQcSampleSchema },
    status: 201,
    summary: 'Draw a quality-control sample of first-level calls into a QC batch',
    handler: ({ ctx, matter, body, user, ip }): Promise<QcSampleResponse> =>
      drawQcSample(ctx.db, matter.matterId, body, actorOf(user, ip)),
  }),
  defineRoute({
    method: 'get',
    path: '/matters/:matterId/qc/samples',
    access: { matter: 'qc.manage' },
    schemas: { params: matterParams },
    summary: "The matter's quality-control samples",
    handler: ({ ctx, matter }): Promise<QcSamplesResponse> =>
      listQcSamples(ctx.db, matter.matterId),
  }),
  defineRoute({
    method: 'get',
    path: '/matters/:matterId/qc/samples/:sampleId',
    access: { matter: 'documents.code' },
    schemas: { params: qcSampleParams },
    summary: 'A QC sample and its calls (the lead, or the QC batch reviewer)',
    handler: ({ ctx, matter, params, user }): Promise<QcSampleResponse> =>
      readQcSample(ctx.db, matter.matterId, params.sampleId, { id: user.id, role: matter.role }),
  }),
  defineRoute({
    method: 'post',
    path: '/matters/:matterId/qc/items/:itemId/decision',
    access: { matter: 'documents.code' },
    schemas: { params: qcItemParams, body: qcDecisionSchema },
    summary: 'Confirm or overturn a first-level call (locks the coding)',
    handler: ({ ctx, matter, params, body, user, ip }) =>
      decideQcItem(
        ctx.db,
        matter.matterId,
        params.itemId,
        body,
        { id: user.id, role: matter.role },
        actorOf(user, ip),
      ),
  }),
  defineRoute({
    method: 'get',
    path: '/matters/:matterId/qc/overturn-rates',
    access: { matter: 'qc.manage' },
    schemas: { params: matterParams },
    summary: 'Overturn rates per first-level reviewer and per code',
    handler: ({ ctx, matter }): Promise<OverturnRatesResponse> =>
      readOverturnRates(ctx.db, matter.matterId),
  }),
  defineRoute({
    method: 'delete',
    path: '/matters/:matterId/documents/:docId/lock',
    access: { matter: 'qc.manage' },
    schemas: { params: documentParams },
    summary: "Unlock a QC-checked document's coding",
    handler: async ({ ctx, matter, params, user, ip }) => {
      await unlockDocument(ctx.db, matter.matterId, params.docId, actorOf(user, ip));
    },
  }),
];
