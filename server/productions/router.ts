import { createReadStream } from 'node:fs';
import { pipeline } from 'node:stream/promises';
import { matterParams } from '../../shared/schemas/common';
import {
  createProductionSchema,
  productionParams,
  resolveFamilySchema,
  type ProductionResponse,
  type ProductionsResponse,
} from '../../shared/schemas/productions';
import { defineRoute } from '../http/route';
import {
  createProduction,
  getProduction,
  listProductions,
  productionDownload,
  requestBuild,
  resolveFamily,
} from './service';

export const productionRoutes = [
  defineRoute({
    method: 'get',
    path: '/matters/:matterId/productions',
    access: { matter: 'productions.manage' },
    schemas: { params: matterParams },
    summary: "The matter's productions, newest first, with state, counts and Bates ranges",
    handler: ({ ctx, matter }): Promise<ProductionsResponse> =>
      listProductions(ctx, matter.matterId),
  }),
  defineRoute({
    method: 'post',
    path: '/matters/:matterId/productions',
    access: { matter: 'productions.manage' },
    schemas: { params: matterParams, body: createProductionSchema },
    status: 201,
    summary:
      'Define a production (source, Bates prefix/start/padding, legend, privileged handling); audited',
    handler: ({ ctx, matter, body, user, ip }): Promise<ProductionResponse> =>
      createProduction(ctx, matter.matterId, body, { id: user.id, email: user.email, ip }),
  }),
  defineRoute({
    method: 'get',
    path: '/matters/:matterId/productions/:productionId',
    access: { matter: 'productions.manage' },
    schemas: { params: productionParams },
    summary: 'A production: state, counts, Bates range and the family check',
    handler: ({ ctx, matter, params }): Promise<ProductionResponse> =>
      getProduction(ctx, matter.matterId, params.productionId),
  }),
  defineRoute({
    method: 'post',
    path: '/matters/:matterId/productions/:productionId/family',
    access: { matter: 'productions.manage' },
    schemas: { params: productionParams, body: resolveFamilySchema },
    summary: 'Resolve the family check: add family members to the set or slip-sheet them; audited',
    handler: ({ ctx, matter, params, body, user, ip }): Promise<ProductionResponse> =>
      resolveFamily(ctx, matter.matterId, params.productionId, body, {
        id: user.id,
        email: user.email,
        ip,
      }),
  }),
  defineRoute({
    method: 'post',
    path: '/matters/:matterId/productions/:productionId/build',
    access: { matter: 'productions.manage' },
    schemas: { params: productionParams },
    status: 202,
    summary: 'Build the production in the background; returns the job; audited',
    handler: ({ ctx, matter, params, user, ip }) =>
      requestBuild(ctx, matter.matterId, params.productionId, {
        id: user.id,
        email: user.email,
        ip,
      }),
  }),
  defineRoute({
    method: 'get',
    path: '/matters/:matterId/productions/:productionId/download',
    access: { matter: 'productions.manage' },
    schemas: { params: productionParams },
    summary:
      'The built production as a zip (PDF, TEXT, NATIVES, DATA/metadata.csv, manifest.json); audited',
    handler: async ({ ctx, matter, params, res, user, ip }) => {
      const { file, filename } = await productionDownload(
        ctx,
        matter.matterId,
        params.productionId,
        { id: user.id, email: user.email, ip },
      );
      res.attachment(filename);
      res.type('application/zip');
      await pipeline(createReadStream(file), res);
    },
  }),
];
