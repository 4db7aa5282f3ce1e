import { matterParams } from '../../shared/schemas/common';
import { documentParams } from '../../shared/schemas/documents';
import { nearDuplicateSettingsSchema } from '../../shared/schemas/relationships';
import { defineRoute } from '../http/route';
import { changeNearDupThreshold, readNearDuplicates, readThread } from './service';

export const relationshipRoutes = [
  defineRoute({
    method: 'get',
    path: '/matters/:matterId/documents/:docId/thread',
    access: { matter: 'documents.read' },
    schemas: { params: documentParams },
    summary: "The document's e-mail thread as a tree, with inclusive flags",
    handler: ({ ctx, matter, params }) => readThread(ctx, matter.matterId, params.docId),
  }),
  defineRoute({
    method: 'get',
    path: '/matters/:matterId/documents/:docId/near-duplicates',
    access: { matter: 'documents.read' },
    schemas: { params: documentParams },
    summary: "The document's near-duplicate group with each member's similarity",
    handler: ({ ctx, matter, params }) => readNearDuplicates(ctx, matter.matterId, params.docId),
  }),
  defineRoute({
    method: 'put',
    path: '/matters/:matterId/near-duplicates/settings',
    access: { matter: 'relationships.manage' },
    schemas: { params: matterParams, body: nearDuplicateSettingsSchema },
    summary: 'Change the near-duplicate threshold (Jaccard) and regroup',
    handler: ({ ctx, matter, body, user, ip }) =>
      changeNearDupThreshold(ctx, matter.matterId, body.threshold, {
        id: user.id,
        email: user.email,
        ip,
      }),
  }),
];
