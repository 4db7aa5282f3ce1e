import { matterParams } from '../../shared/schemas/common';
import {
  moreLikeResponsiveSchema,
  prioritisedBatchSchema,
  type MoreLikeResponsiveResponse,
  type PrioritisedBatchResponse,
  type PrioritisedStatusResponse,
  type TrainResponse,
} from '../../shared/schemas/prioritised';
import { defineRoute } from '../http/route';
import { createPrioritisedBatch } from './batches';
import { moreLikeResponsive, prioritisedStatus, requestTraining } from './service';

export const prioritisedRoutes = [
  defineRoute({
    method: 'get',
    path: '/matters/:matterId/prioritised',
    access: { matter: 'search.run' },
    schemas: { params: matterParams },
    summary: 'The learned ranking: code counts, how many more are needed, the current model',
    handler: ({ ctx, matter }): Promise<PrioritisedStatusResponse> =>
      prioritisedStatus(ctx, matter.matterId),
  }),
  defineRoute({
    method: 'post',
    path: '/matters/:matterId/prioritised/train',
    access: { matter: 'ranking.train' },
    schemas: { params: matterParams },
    status: 202,
    summary: 'Queue a retrain of the learned ranking now (a background job); audited',
    handler: ({ ctx, matter, user, ip }): Promise<TrainResponse> =>
      requestTraining(ctx, matter.matterId, { id: user.id, email: user.email, ip }),
  }),
  defineRoute({
    method: 'post',
    path: '/matters/:matterId/prioritised/more-like-responsive',
    access: { matter: 'search.run' },
    schemas: { params: matterParams, body: moreLikeResponsiveSchema },
    summary: 'More like the documents coded Responsive (Rocchio feedback, no training); audited',
    handler: ({ ctx, matter, body, user, ip }): Promise<MoreLikeResponsiveResponse> =>
      moreLikeResponsive(ctx, matter.matterId, body, { id: user.id, email: user.email, ip }),
  }),
  defineRoute({
    method: 'post',
    path: '/matters/:matterId/prioritised/batches',
    access: { matter: 'ranking.train' },
    schemas: { params: matterParams, body: prioritisedBatchSchema },
    status: 201,
    summary:
      'A batch of the next most likely responsive documents, 1 in 10 drawn at random; audited',
    handler: ({ ctx, matter, body, user, ip }): Promise<PrioritisedBatchResponse> =>
      createPrioritisedBatch(ctx, matter.matterId, body, { id: user.id, email: user.email, ip }),
  }),
];
