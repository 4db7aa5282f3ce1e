import { matterParams } from '../../shared/schemas/common';
import { trashParams } from '../../shared/schemas/trash';
import { z } from 'zod';
import { defineRoute } from '../http/route';
import { purgeFromTrash, readTrash, restoreFromTrash } from './service';

const actorOf = (user: { id: string; email: string }, ip: string | null) => ({
  id: user.id,
  email: user.email,
  ip,
});

export const trashRoutes = [
  defineRoute({
    method: 'get',
    path: '/matters/:matterId/trash',
    access: { matter: 'documents.delete' },
    schemas: { params: matterParams },
    summary: 'Deleted coded documents awaiting restore or purge',
    handler: ({ ctx, matter }) => readTrash(ctx, matter.matterId),
  }),
  defineRoute({
    method: 'post',
    path: '/matters/:matterId/trash/:trashId/restore',
    access: { matter: 'documents.restore' },
    schemas: { params: trashParams, body: z.object({}).optional() },
    summary: 'Restore a trashed document with its attachments, codes and notes',
    handler: ({ ctx, matter, params, user, ip }) =>
      restoreFromTrash(ctx, matter.matterId, params.trashId, actorOf(user, ip)),
  }),
  defineRoute({
    method: 'delete',
    path: '/matters/:matterId/trash/:trashId',
    access: { matter: 'documents.purge' },
    schemas: { params: trashParams },
    summary: 'Purge a trashed document: complete, irreversible deletion (refused under a hold)',
    handler: ({ ctx, matter, params, user, ip }) =>
      purgeFromTrash(ctx, matter.matterId, params.trashId, actorOf(user, ip)),
  }),
];
