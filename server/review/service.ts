import { nearestTerms } from '../engine/index';
import { analyze } from '../engine/index';
import type { DocumentRef, DocumentStatus } from '../../shared/schemas/documents';
import {
  REVIEW_TEXT_MAX_CHARS,
  type Note,
  type PrivilegeEntry,
  type PrivilegeEntryReq,
  type ReviewQueryReq,
  type ReviewResponse,
} from '../../shared/schemas/review';
import { recordAudit } from '../audit/record';
import { appliedCodesOf } from '../codes/service';
import type { AppContext } from '../context';
import type { Db } from '../db/database';
import { notFound } from '../http/errors';
import { collectSurfaces, highlightRanges, surfaceOf, termSpans } from '../search/highlight';
import { NEAREST_TERMS } from '../search/ranking';
import {
  findPrivilegeEntry,
  findRef,
  findReviewDocument,
  findText,
  insertNote,
  listNotes,
  listRefs,
  upsertPrivilegeEntry,
} from './queries';

export interface Actor {
  id: string;
  email: string;
  ip: string | null;
}

type RefRow = NonNullable<Awaited<ReturnType<typeof findRef>>>;
type NoteRow = Awaited<ReturnType<typeof listNotes>>[number];
type PrivilegeRow = NonNullable<Awaited<ReturnType<typeof findPrivilegeEntry>>>;

function refToApi(row: RefRow): DocumentRef {
  return {
    id: row.id,
    controlNumber: row.control_number,
    title: row.title || row.original_name,
    name: row.original_name,
    status: row.extract_status as DocumentStatus,
  };
}

function noteToApi(row: NoteRow): Note {
  return {
    id: row.id,
    body: row.body,
    author: row.author_name
      ? { id: row.author_id, name: row.author_name, email: row.author_email ?? '' }
      : null,
    createdAt: row.created_at,
  };
}

function privilegeToApi(row: PrivilegeRow): PrivilegeEntry {
  return {
    type: row.privilege_type,
    basis: row.basis,
    description: row.description,
    treatment: row.treatment,
    updatedBy: row.updater_name
      ? { id: row.updated_by, name: row.updater_name, email: row.updater_email ?? '' }
      : null,
    updatedAt: row.updated_at,
  };
}

async function requireDocument(db: Db, matterId: number, docId: number) {
  const doc = await findReviewDocument(db, matterId, docId);
  if (!doc) throw notFound('Document');
  return doc;
}

/** GET .../documents/:docId/review: everything the viewer shows; audited as document.viewed. */
export async function readReview(
  ctx: AppContext,
  matterId: number,
  docId: number,
  query: ReviewQueryReq,
  actor: Actor,
): Promise<ReviewResponse> {
  const doc = await requireDocument(ctx.db, matterId, docId);
  // A duplicate shows its first copy's text (it has none of its own).
  const text =
    (await findText(ctx.db, doc.id)) ??
    (doc.duplicate_of ? await findText(ctx.db, doc.duplicate_of) : undefined);
  const fullBody = text?.body ?? '';
  const truncated = fullBody.length > REVIEW_TEXT_MAX_CHARS;
  const body = truncated ? fullBody.slice(0, REVIEW_TEXT_MAX_CHARS) : fullBody;

  const q = query.q?.trim() ?? '';
  const queryTerms = new Set(analyze(q));
  let concept = new Set<string>();
  const space = q && query.mode !== 'keyword' ? await ctx.index.getSpace(matterId) : null;
  if (space) {
    const { vector } = space.queryVector(q);
    if (vector.some((v) => v !== 0)) {
      concept = new Set(
        nearestTerms(space, vector, NEAREST_TERMS + queryTerms.size)
          .filter((t) => !queryTerms.has(t.term) && t.similarity > 0)
          .slice(0, NEAREST_TERMS)
          .map((t) => t.term),
      );
    }
  }
  const spans = termSpans(body, REVIEW_TEXT_MAX_CHARS);
  const highlights = q ? highlightRanges(spans, { query: queryTerms, concept }) : [];
  const surfaces = new Map<string, Map<string, number>>();
  collectSurfaces(spans, surfaces);

  const [codes, notes, privilege, parent, attachments, duplicates, locked] = await Promise.all([
    appliedCodesOf(ctx.db, [doc.id]),
    listNotes(ctx.db, doc.id),
    findPrivilegeEntry(ctx.db, doc.id),
    doc.parent_id ? findRef(ctx.db, matterId, doc.parent_id) : Promise.resolve(undefined),
    listRefs(ctx.db, matterId, { parentId: doc.id }),
    listRefs(ctx.db, matterId, { duplicateOf: doc.id }),
    ctx.db
      .selectFrom('coding_locks')
      .select('document_id')
      .where('document_id', '=', doc.id)
      .executeTakeFirst(),
  ]);
  await recordAudit(ctx.db, {
    actorId: actor.id,
    actorEmail: actor.email,
    ip: actor.ip,
    matterId,
    action: 'document.viewed',
    targetType: 'document',
    targetId: doc.id,
    detail: { controlNumber: doc.control_number, query: q || null },
  });
  return {
    document: {
      id: doc.id,
      controlNumber: doc.control_number,
      title: doc.title || doc.original_name,
      name: doc.original_name,
      docType: doc.doc_type,
      mime: doc.mime,
      custodian:
        doc.custodian_id !== null && doc.custodian_name
          ? { id: doc.custodian_id, name: doc.custodian_name }
          : null,
      author: doc.author,
      recipients: doc.recipients,
      emailFrom: doc.email_from,
      emailTo: doc.email_to,
      emailCc: doc.email_cc,
      emailBcc: doc.email_bcc,
      sentAt: doc.sent_at,
      familyId: doc.family_id,
      locked: locked !== undefined,
      pageCount: doc.page_count,
      size: doc.size,
      status: doc.extract_status,
      parentId: doc.parent_id,
      duplicateOf: doc.duplicate_of,
    },
    text: { title: text?.title ?? '', body, truncated },
    highlights,
    conceptTerms: [...concept].map((t) => surfaceOf(t, surfaces, space)),
    codes: codes.get(doc.id) ?? [],
    notes: notes.map(noteToApi),
    privilege: privilege ? privilegeToApi(privilege) : null,
    family: { parent: parent ? refToApi(parent) : null, attachments: attachments.map(refToApi) },
    duplicates: duplicates.map(refToApi),
  };
}

export async function readNotes(db: Db, matterId: number, docId: number) {
  await requireDocument(db, matterId, docId);
  return { notes: (await listNotes(db, docId)).map(noteToApi) };
}

export async function addNote(db: Db, matterId: number, docId: number, body: string, actor: Actor) {
  const doc = await requireDocument(db, matterId, docId);
  const id = await db.transaction().execute(async (trx) => {
    const noteId = await insertNote(trx, docId, actor.id, body);
    await recordAudit(trx, {
      actorId: actor.id,
      actorEmail: actor.email,
      ip: actor.ip,
      matterId,
      action: 'note.added',
      targetType: 'document',
      targetId: docId,
      detail: { controlNumber: doc.control_number, noteId, length: body.length },
    });
    return noteId;
  });
  const note = (await listNotes(db, docId)).find((n) => n.id === id)!;
  return { note: noteToApi(note) };
}

export async function putPrivilegeEntry(
  db: Db,
  matterId: number,
  docId: number,
  input: PrivilegeEntryReq,
  actor: Actor,
) {
  const doc = await requireDocument(db, matterId, docId);
  const before = await findPrivilegeEntry(db, docId);
  await db.transaction().execute(async (trx) => {
    await upsertPrivilegeEntry(trx, docId, { ...input, userId: actor.id });
    await recordAudit(trx, {
      actorId: actor.id,
      actorEmail: actor.email,
      ip: actor.ip,
      matterId,
      action: 'privilege.updated',
      targetType: 'document',
      targetId: docId,
      detail: {
        controlNumber: doc.control_number,
        before: before ? { basis: before.basis, description: before.description } : null,
        after: input,
      },
    });
  });
  return { privilege: privilegeToApi((await findPrivilegeEntry(db, docId))!) };
}
