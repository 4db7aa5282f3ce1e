import {
  assignBatchSchema,
  batchParams,
  createBatchesSchema,
  listBatchesQuerySchema,
  type BatchResponse,
  type BatchesResponse,
  type CreateBatchesResponse,
  type TeamProgressResponse,
} from '../../shared/schemas/batches';
import { matterParams } from '../../shared/schemas/common';
import { defineRoute } from '../http/route';
import {
  assignBatch,
  checkinBatch,
  checkoutBatch,
  cutBatches,
  listBatches,
  readBatch,
  teamProgress,
} from './service';

const actorOf = (user: { id: string; email: string }, ip: string | null) => ({
  id: user.id,
  email: user.email,
  ip,
});

export const batchRoutes = [
  defineRoute({
    method: 'post',
    path: '/matters/:matterId/batches',
    access: { matter: 'batches.manage' },
    schemas: { params: matterParams, body: createBatchesSchema },
    status: 201,
    summary: 'Cut review batches from a search or saved search (size cap, families whole)',
    handler: ({ ctx, matter, body, user, ip }): Promise<CreateBatchesResponse> =>
      cutBatches(ctx, matter.matterId, body, actorOf(user, ip)),
  }),
  defineRoute({
    method: 'get',
    path: '/matters/:matterId/batches',
    access: { matter: 'documents.code' },
    schemas: { params: matterParams, query: listBatchesQuerySchema },
    summary: 'Batches with assignee, state and progress (a reviewer sees their own)',
    handler: ({ ctx, matter, query, user }): Promise<BatchesResponse> =>
      listBatches(ctx.db, matter.matterId, { id: user.id, role: matter.role }, query),
  }),
  defineRoute({
    method: 'get',
    path: '/matters/:matterId/batches/progress',
    access: { matter: 'batches.manage' },
    schemas: { params: matterParams },
    summary: 'Team progress per batch and per reviewer',
    handler: ({ ctx, matter }): Promise<TeamProgressResponse> =>
      teamProgress(ctx.db, matter.matterId),
  }),
  defineRoute({
    method: 'get',
    path: '/matters/:matterId/batches/:batchId',
    access: { matter: 'documents.code' },
    schemas: { params: batchParams },
    summary: 'A batch and its documents in order',
    handler: ({ ctx, matter, params, user }): Promise<BatchResponse> =>
      readBatch(ctx.db, matter.matterId, params.batchId, { id: user.id, role: matter.role }),
  }),
  defineRoute({
    method: 'post',
    path: '/matters/:matterId/batches/:batchId/assign',
    access: { matter: 'batches.manage' },
    schemas: { params: batchParams, body: assignBatchSchema },
    summary: 'Assign a batch to a reviewer',
    handler: async ({ ctx, matter, params, body, user, ip }) => ({
      batch: await assignBatch(
        ctx.db,
        matter.matterId,
        params.batchId,
        body.userId,
        actorOf(user, ip),
      ),
    }),
  }),
  defineRoute({
    method: 'post',
    path: '/matters/:matterId/batches/:batchId/checkout',
    access: { matter: 'documents.code' },
    schemas: { params: batchParams },
    summary: 'Check a batch out to work on it',
    handler: async ({ ctx, matter, params, user, ip }) => ({
      batch: await checkoutBatch(
        ctx.db,
        matter.matterId,
        params.batchId,
        { id: user.id, role: matter.role },
        actorOf(user, ip),
      ),
    }),
  }),
  defineRoute({
    method: 'post',
    path: '/matters/:matterId/batches/:batchId/checkin',
    access: { matter: 'documents.code' },
    schemas: { params: batchParams },
    summary: 'Check a batch in as done (refused while required codes are missing)',
    handler: async ({ ctx, matter, params, user, ip }) => ({
      batch: await checkinBatch(
        ctx.db,
        matter.matterId,
        params.batchId,
        { id: user.id, role: matter.role },
        actorOf(user, ip),
      ),
    }),
  }),
];
