import { documentParams } from '../../shared/schemas/documents';
import {
  createNoteSchema,
  privilegeEntrySchema,
  reviewQuerySchema,
  type NoteResponse,
  type NotesResponse,
  type PrivilegeEntryResponse,
  type ReviewResponse,
} from '../../shared/schemas/review';
import { defineRoute } from '../http/route';
import { addNote, putPrivilegeEntry, readNotes, readReview } from './service';

export const reviewRoutes = [
  defineRoute({
    method: 'get',
    path: '/matters/:matterId/documents/:docId/review',
    access: { matter: 'documents.read' },
    schemas: { params: documentParams, query: reviewQuerySchema },
    summary:
      'Viewer data: text with highlights for ?q=, codes, notes, privilege entry, family; audited',
    handler: ({ ctx, matter, params, query, user, ip }): Promise<ReviewResponse> =>
      readReview(ctx, matter.matterId, params.docId, query, { id: user.id, email: user.email, ip }),
  }),
  defineRoute({
    method: 'get',
    path: '/matters/:matterId/documents/:docId/notes',
    access: { matter: 'documents.read' },
    schemas: { params: documentParams },
    summary: "A document's notes, oldest first",
    handler: ({ ctx, matter, params }): Promise<NotesResponse> =>
      readNotes(ctx.db, matter.matterId, params.docId),
  }),
  defineRoute({
    method: 'post',
    path: '/matters/:matterId/documents/:docId/notes',
    access: { matter: 'documents.code' },
    schemas: { params: documentParams, body: createNoteSchema },
    status: 201,
    summary: 'Add a note to a document',
    handler: ({ ctx, matter, params, body, user, ip }): Promise<NoteResponse> =>
      addNote(ctx.db, matter.matterId, params.docId, body.body, {
        id: user.id,
        email: user.email,
        ip,
      }),
  }),
  defineRoute({
    method: 'put',
    path: '/matters/:matterId/documents/:docId/privilege',
    access: { matter: 'documents.code' },
    schemas: { params: documentParams, body: privilegeEntrySchema },
    summary: "Set a document's privilege basis and description (privilege log fields)",
    handler: ({ ctx, matter, params, body, user, ip }): Promise<PrivilegeEntryResponse> =>
      putPrivilegeEntry(ctx.db, matter.matterId, params.docId, body, {
        id: user.id,
        email: user.email,
        ip,
      }),
  }),
];
