import { matterParams } from '../../shared/schemas/common';
import { holdParams, releaseHoldSchema, setHoldSchema } from '../../shared/schemas/holds';
import { defineRoute } from '../http/route';
import { readHolds, releaseHold, setHold } from './service';

const actorOf = (user: { id: string; email: string }, ip: string | null) => ({
  id: user.id,
  email: user.email,
  ip,
});

export const holdRoutes = [
  defineRoute({
    method: 'get',
    path: '/matters/:matterId/holds',
    access: { matter: 'documents.read' },
    schemas: { params: matterParams },
    summary: "The matter's legal holds, active first",
    handler: ({ ctx, matter }) => readHolds(ctx.db, matter.matterId),
  }),
  defineRoute({
    method: 'post',
    path: '/matters/:matterId/holds',
    access: { matter: 'holds.manage' },
    schemas: { params: matterParams, body: setHoldSchema },
    status: 201,
    summary: 'Set a legal hold on the matter or one custodian (with a reason)',
    handler: ({ ctx, matter, body, user, ip }) =>
      setHold(ctx.db, matter.matterId, body, actorOf(user, ip)),
  }),
  defineRoute({
    method: 'post',
    path: '/matters/:matterId/holds/:holdId/release',
    access: { matter: 'holds.manage' },
    schemas: { params: holdParams, body: releaseHoldSchema },
    summary: 'Release a legal hold (with a reason)',
    handler: ({ ctx, matter, params, body, user, ip }) =>
      releaseHold(ctx.db, matter.matterId, params.holdId, body, actorOf(user, ip)),
  }),
];
