import {
  bulkCodingSchema,
  codeGroupParams,
  codeParams,
  createCodeGroupSchema,
  updateCodeGroupSchema,
  type CodeGroupResponse,
  createCodeSchema,
  setDocumentCodesSchema,
  updateCodeSchema,
  type BulkCodingResponse,
  type CodeResponse,
  type CodesResponse,
  type DocumentCodesResponse,
} from '../../shared/schemas/codes';
import { matterParams } from '../../shared/schemas/common';
import { documentParams } from '../../shared/schemas/documents';
import { defineRoute } from '../http/route';
import { afterCodingQuietly } from '../prioritised/hooks';
import {
  archiveCode,
  bulkCode,
  changeCode,
  changeCodeGroup,
  createCodeGroup,
  createCode,
  listCodes,
  setDocumentCodes,
} from './service';

export const codeRoutes = [
  defineRoute({
    method: 'get',
    path: '/matters/:matterId/codes',
    access: { matter: 'documents.read' },
    schemas: { params: matterParams },
    summary: "The matter's code set (archived codes included)",
    handler: ({ ctx, matter }): Promise<CodesResponse> => listCodes(ctx.db, matter.matterId),
  }),
  defineRoute({
    method: 'post',
    path: '/matters/:matterId/codes',
    access: { matter: 'codes.manage' },
    schemas: { params: matterParams, body: createCodeSchema },
    status: 201,
    summary: 'Add a code to the code set',
    handler: async ({ ctx, matter, body, user, ip }): Promise<CodeResponse> => ({
      code: await createCode(ctx.db, matter.matterId, body, { id: user.id, email: user.email, ip }),
    }),
  }),
  defineRoute({
    method: 'patch',
    path: '/matters/:matterId/codes/:codeId',
    access: { matter: 'codes.manage' },
    schemas: { params: codeParams, body: updateCodeSchema },
    summary: 'Rename, re-key, reorder, archive or restore a code',
    handler: async ({ ctx, matter, params, body, user, ip }): Promise<CodeResponse> => ({
      code: await changeCode(ctx.db, matter.matterId, params.codeId, body, {
        id: user.id,
        email: user.email,
        ip,
      }),
    }),
  }),
  defineRoute({
    method: 'delete',
    path: '/matters/:matterId/codes/:codeId',
    access: { matter: 'codes.manage' },
    schemas: { params: codeParams },
    summary: 'Archive a code (documents keep it; it can no longer be applied)',
    handler: async ({ ctx, matter, params, user, ip }): Promise<CodeResponse> => ({
      code: await archiveCode(ctx.db, matter.matterId, params.codeId, {
        id: user.id,
        email: user.email,
        ip,
      }),
    }),
  }),
  defineRoute({
    method: 'post',
    path: '/matters/:matterId/codes/bulk',
    access: { matter: 'documents.code' },
    schemas: { params: matterParams, body: bulkCodingSchema },
    summary: 'Add and remove codes on many documents (one audit row per document changed)',
    handler: async ({ ctx, matter, body, user, ip }): Promise<BulkCodingResponse> => {
      const result = await bulkCode(ctx.db, matter.matterId, body, {
        id: user.id,
        email: user.email,
        ip,
      });
      await afterCodingQuietly(ctx, matter.matterId);
      return result;
    },
  }),
  defineRoute({
    method: 'put',
    path: '/matters/:matterId/documents/:docId/codes',
    access: { matter: 'documents.code' },
    schemas: { params: documentParams, body: setDocumentCodesSchema },
    summary: "Set a document's codes",
    handler: async ({ ctx, matter, params, body, user, ip }): Promise<DocumentCodesResponse> => {
      const result = await setDocumentCodes(ctx.db, matter.matterId, params.docId, body, {
        id: user.id,
        email: user.email,
        ip,
      });
      await afterCodingQuietly(ctx, matter.matterId);
      return result;
    },
  }),
  defineRoute({
    method: 'post',
    path: '/matters/:matterId/code-groups',
    access: { matter: 'codes.manage' },
    schemas: { params: matterParams, body: createCodeGroupSchema },
    status: 201,
    summary: 'Add a code group (single-choice, multi-choice or the privilege group)',
    handler: ({ ctx, matter, body, user, ip }): Promise<CodeGroupResponse> =>
      createCodeGroup(ctx.db, matter.matterId, body, { id: user.id, email: user.email, ip }),
  }),
  defineRoute({
    method: 'patch',
    path: '/matters/:matterId/code-groups/:groupId',
    access: { matter: 'codes.manage' },
    schemas: { params: codeGroupParams, body: updateCodeGroupSchema },
    summary: 'Rename a code group, mark it required, or make it follow families and duplicates',
    handler: ({ ctx, matter, params, body, user, ip }): Promise<CodeGroupResponse> =>
      changeCodeGroup(ctx.db, matter.matterId, params.groupId, body, {
        id: user.id,
        email: user.email,
        ip,
      }),
  }),
];
