import { matterParams } from '../../shared/schemas/common';
import {
  createGroupingSchema,
  dimensionLabelSchema,
  dimensionParams,
  dimensionsQuerySchema,
  groupingParams,
  mapQuerySchema,
  neighboursQuerySchema,
  type DimensionLabelResponse,
  type DimensionsResponse,
  type GroupingResponse,
  type GroupingsListResponse,
  type HealthResponse,
  type MapResponse,
  type NeighboursResponse,
  type SpectrumResponse,
} from '../../shared/schemas/concepts';
import { defineRoute } from '../http/route';
import { conceptsServiceFor } from './service';

// Issue 6: the concept space seen by the lead and attorneys (concepts.view); only the
// lead names dimensions (concepts.label). Rebuilding is POST .../index/rebuild.
export const conceptRoutes = [
  defineRoute({
    method: 'get',
    path: '/matters/:matterId/concepts/spectrum',
    access: { matter: 'concepts.view' },
    schemas: { params: matterParams },
    summary:
      'Singular values, cumulative energy and k of the current and the previous index version',
    handler: ({ ctx, matter }): Promise<SpectrumResponse> =>
      conceptsServiceFor(ctx).spectrum(matter.matterId),
  }),
  defineRoute({
    method: 'get',
    path: '/matters/:matterId/concepts/dimensions',
    access: { matter: 'concepts.view' },
    schemas: { params: matterParams, query: dimensionsQuerySchema },
    summary: 'Leading concept dimensions: terms at both ends, typical documents, labels',
    handler: ({ ctx, matter, query }): Promise<DimensionsResponse> =>
      conceptsServiceFor(ctx).dimensions(matter.matterId, query),
  }),
  defineRoute({
    method: 'put',
    path: '/matters/:matterId/concepts/dimensions/:dim/label',
    access: { matter: 'concepts.label' },
    schemas: { params: dimensionParams, body: dimensionLabelSchema },
    summary: 'Name a concept dimension of the current index version',
    handler: ({ ctx, matter, params, body, user }): Promise<DimensionLabelResponse> =>
      conceptsServiceFor(ctx).setLabel(matter.matterId, params.dim, body.label, user.id),
  }),
  defineRoute({
    method: 'delete',
    path: '/matters/:matterId/concepts/dimensions/:dim/label',
    access: { matter: 'concepts.label' },
    schemas: { params: dimensionParams },
    summary: "Remove a concept dimension's name",
    handler: ({ ctx, matter, params }): Promise<DimensionLabelResponse> =>
      conceptsServiceFor(ctx).clearLabel(matter.matterId, params.dim),
  }),
  defineRoute({
    method: 'get',
    path: '/matters/:matterId/concepts/terms/neighbours',
    access: { matter: 'concepts.view' },
    schemas: { params: matterParams, query: neighboursQuerySchema },
    summary: 'Nearest terms of a word in the concept space, with cosine similarity',
    handler: ({ ctx, matter, query }): Promise<NeighboursResponse> =>
      conceptsServiceFor(ctx).neighbours(matter.matterId, query),
  }),
  defineRoute({
    method: 'get',
    path: '/matters/:matterId/concepts/map',
    access: { matter: 'concepts.view' },
    schemas: { params: matterParams, query: mapQuerySchema },
    summary: 'Every indexed document as a point on two concept dimensions (parallel arrays)',
    handler: ({ ctx, matter, query }): Promise<MapResponse> =>
      conceptsServiceFor(ctx).map(matter.matterId, query),
  }),
  defineRoute({
    method: 'get',
    path: '/matters/:matterId/concepts/groupings',
    access: { matter: 'concepts.view' },
    schemas: { params: matterParams },
    summary: "k-means groupings of the current index version's documents",
    handler: ({ ctx, matter }): Promise<GroupingsListResponse> =>
      conceptsServiceFor(ctx).listGroupings(matter.matterId),
  }),
  defineRoute({
    method: 'post',
    path: '/matters/:matterId/concepts/groupings',
    access: { matter: 'concepts.view' },
    schemas: { params: matterParams, body: createGroupingSchema },
    summary:
      'Group the documents by k-means: 200 with the grouping when it exists, else 202 with the job computing it',
    handler: async ({ ctx, matter, body, user, res }) => {
      const { status, response } = await conceptsServiceFor(ctx).createGrouping(
        matter.matterId,
        body,
        user.id,
      );
      res.status(status).json(response);
      return undefined;
    },
  }),
  defineRoute({
    method: 'get',
    path: '/matters/:matterId/concepts/groupings/:groupingId',
    access: { matter: 'concepts.view' },
    schemas: { params: groupingParams },
    summary: 'One grouping: its groups with sizes and top terms',
    handler: ({ ctx, matter, params }): Promise<GroupingResponse> =>
      conceptsServiceFor(ctx).getGrouping(matter.matterId, params.groupingId),
  }),
  defineRoute({
    method: 'get',
    path: '/matters/:matterId/concepts/health',
    access: { matter: 'concepts.view' },
    schemas: { params: matterParams },
    summary: 'Index health in plain words: sizes, sparsity, sigma_1, condition, energy, drift',
    handler: ({ ctx, matter }): Promise<HealthResponse> =>
      conceptsServiceFor(ctx).health(matter.matterId),
  }),
];
