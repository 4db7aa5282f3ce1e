import { documentParams } from '../../shared/schemas/documents';
import {
  createRedactionSchema,
  redactionParams,
  type RedactionsResponse,
} from '../../shared/schemas/productions';
import { defineRoute } from '../http/route';
import { addRedaction, listRedactions, removeRedaction } from './service';

export const redactionRoutes = [
  defineRoute({
    method: 'get',
    path: '/matters/:matterId/documents/:docId/redactions',
    access: { matter: 'documents.read' },
    schemas: { params: documentParams },
    summary: "A document's redactions in force (spans, patterns with their hits, PDF boxes)",
    handler: ({ ctx, matter, params }): Promise<RedactionsResponse> =>
      listRedactions(ctx.db, matter.matterId, params.docId),
  }),
  defineRoute({
    method: 'post',
    path: '/matters/:matterId/documents/:docId/redactions',
    access: { matter: 'documents.redact' },
    schemas: { params: documentParams, body: createRedactionSchema },
    status: 201,
    summary: 'Mark a redaction (a text span, every hit of a term or format, or a PDF box); audited',
    handler: ({ ctx, matter, params, body, user, ip }) =>
      addRedaction(ctx.db, matter.matterId, params.docId, body, {
        id: user.id,
        email: user.email,
        ip,
      }),
  }),
  defineRoute({
    method: 'delete',
    path: '/matters/:matterId/documents/:docId/redactions/:redactionId',
    access: { matter: 'documents.redact' },
    schemas: { params: redactionParams },
    status: 204,
    summary: 'Remove a redaction not yet produced; audited',
    handler: async ({ ctx, matter, params, user, ip }) => {
      await removeRedaction(ctx.db, matter.matterId, params.docId, params.redactionId, {
        id: user.id,
        email: user.email,
        ip,
      });
    },
  }),
];
