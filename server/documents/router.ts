import { z } from 'zod';
import { matterParams } from '../../shared/schemas/common';
import {
  createCustodianSchema,
  documentParams,
  documentsQuerySchema,
  uploadFieldsSchema,
  type UploadBatchResponse,
} from '../../shared/schemas/documents';
import { deleteDocumentSchema } from '../../shared/schemas/trash';
import { defineRoute } from '../http/route';
import { loadFiles } from './ingest';
import {
  createCustodian,
  deleteDocument,
  listDocuments,
  readCustodians,
  readDocument,
  readDocumentText,
  retryDocument,
  sendOriginal,
} from './service';
import { incomingFilesOf, removeUploadDir, uploadMiddleware } from './upload';

const actorOf = (user: { id: string; email: string }, ip: string | null) => ({
  id: user.id,
  email: user.email,
  ip,
});

export const documentRoutes = [
  defineRoute({
    method: 'post',
    path: '/matters/:matterId/documents',
    access: { matter: 'documents.upload' },
    schemas: { params: matterParams, body: uploadFieldsSchema },
    status: 201,
    summary: 'Upload files (multipart, field "files"; optional "custodian") as one batch',
    middleware: uploadMiddleware,
    handler: async ({ ctx, req, matter, body, user, ip }): Promise<UploadBatchResponse> => {
      try {
        return await loadFiles(ctx, incomingFilesOf((req.files as Express.Multer.File[]) ?? []), {
          matterId: matter.matterId,
          custodianName: body.custodian ?? null,
          source: 'upload',
          actor: actorOf(user, ip),
        });
      } finally {
        await removeUploadDir(ctx, req);
      }
    },
  }),
  defineRoute({
    method: 'get',
    path: '/matters/:matterId/documents',
    access: { matter: 'documents.read' },
    schemas: { params: matterParams, query: documentsQuerySchema },
    summary: "The matter's documents in control-number order, paged and filtered",
    handler: ({ ctx, matter, query }) => listDocuments(ctx, matter.matterId, query),
  }),
  defineRoute({
    method: 'get',
    path: '/matters/:matterId/documents/:docId',
    access: { matter: 'documents.read' },
    schemas: { params: documentParams },
    summary: "A document's metadata, family and duplicates",
    handler: ({ ctx, matter, params }) => readDocument(ctx, matter.matterId, params.docId),
  }),
  defineRoute({
    method: 'get',
    path: '/matters/:matterId/documents/:docId/text',
    access: { matter: 'documents.read' },
    schemas: { params: documentParams },
    summary: "A document's extracted text",
    handler: ({ ctx, matter, params }) => readDocumentText(ctx, matter.matterId, params.docId),
  }),
  defineRoute({
    method: 'get',
    path: '/matters/:matterId/documents/:docId/original',
    access: { matter: 'documents.read' },
    schemas: { params: documentParams },
    summary: 'Download the original file (audited)',
    handler: async ({ ctx, res, matter, params, user, ip }) => {
      await sendOriginal(ctx, res, matter.matterId, params.docId, actorOf(user, ip));
      return undefined;
    },
  }),
  defineRoute({
    method: 'post',
    path: '/matters/:matterId/documents/:docId/retry',
    access: { matter: 'documents.organise' },
    schemas: { params: documentParams, body: z.object({}).optional() },
    status: 202,
    summary: 'Queue a failed document for extraction again',
    handler: ({ ctx, matter, params, user, ip }) =>
      retryDocument(ctx, matter.matterId, params.docId, actorOf(user, ip)),
  }),
  defineRoute({
    method: 'delete',
    path: '/matters/:matterId/documents/:docId',
    access: { matter: 'documents.organise' },
    schemas: { params: documentParams, body: deleteDocumentSchema },
    summary:
      'Remove a document (failed: paralegals and leads; any other: leads; refused under a legal hold; a coded one needs a reason and goes to the trash)',
    handler: ({ ctx, matter, params, body, user, ip }) =>
      deleteDocument(
        ctx,
        matter.matterId,
        params.docId,
        matter.role,
        actorOf(user, ip),
        body?.reason,
      ),
  }),
  defineRoute({
    method: 'get',
    path: '/matters/:matterId/custodians',
    access: { matter: 'documents.read' },
    schemas: { params: matterParams },
    summary: "The matter's custodians with document counts",
    handler: ({ ctx, matter }) => readCustodians(ctx, matter.matterId),
  }),
  defineRoute({
    method: 'post',
    path: '/matters/:matterId/custodians',
    access: { matter: 'documents.upload' },
    schemas: { params: matterParams, body: createCustodianSchema },
    status: 201,
    summary: 'Add a custodian',
    handler: ({ ctx, matter, body, user, ip }) =>
      createCustodian(ctx, matter.matterId, body.name, actorOf(user, ip)),
  }),
];
