import { matterParams } from '../../shared/schemas/common';
import {
  rebuildIndexSchema,
  type IndexStateResponse,
  type RebuildIndexResponse,
} from '../../shared/schemas/indexing';
import { defineRoute } from '../http/route';

export const indexRoutes = [
  defineRoute({
    method: 'get',
    path: '/matters/:matterId/index',
    access: { matter: 'index.view' },
    schemas: { params: matterParams },
    summary: "The matter's index: counts, current version with diagnostics, active job",
    handler: ({ ctx, matter }): Promise<IndexStateResponse> => ctx.index.state(matter.matterId),
  }),
  defineRoute({
    method: 'post',
    path: '/matters/:matterId/index/rebuild',
    access: { matter: 'index.rebuild' },
    schemas: { params: matterParams, body: rebuildIndexSchema },
    status: 202,
    summary: 'Queue a full rebuild of the concept space (optional k, weighting)',
    handler: ({ ctx, matter, body, user, ip }): Promise<RebuildIndexResponse> =>
      ctx.index.requestRebuild(matter.matterId, body, { id: user.id, email: user.email, ip }),
  }),
];
