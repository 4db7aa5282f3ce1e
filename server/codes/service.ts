import type {
  AppliedCode,
  BulkCodingResponse,
  Code,
  CodesResponse,
  CreateCodeReq,
  DocumentCodesResponse,
  DocumentCoding,
  UpdateCodeReq,
} from '../../shared/schemas/codes';
import { recordAudit } from '../audit/record';
import type { Db } from '../db/database';
import { conflict, notFound, validationError } from '../http/errors';
import {
  addDocumentCodes,
  existingDocumentIds,
  findCode,
  findCodeByName,
  findCodeByShortcut,
  findCodesByIds,
  insertCode,
  listAppliedCodes,
  listCodesWithCounts,
  nextSortOrder,
  removeDocumentCodes,
  updateCode,
} from './queries';

export interface Actor {
  id: string;
  email: string;
  ip: string | null;
}

const auditActor = (actor: Actor) => ({ actorId: actor.id, actorEmail: actor.email, ip: actor.ip });

type CodeRowWithCount = Awaited<ReturnType<typeof listCodesWithCounts>>[number];
type AppliedRow = Awaited<ReturnType<typeof listAppliedCodes>>[number];

function codeRowToApi(row: CodeRowWithCount): Code {
  return {
    id: row.id,
    name: row.name,
    shortcut: row.shortcut,
    sortOrder: row.sort_order,
    marksPrivileged: row.marks_privileged === 1,
    archivedAt: row.archived_at,
    documentCount: Number(row.document_count ?? 0),
  };
}

function appliedRowToApi(row: AppliedRow): AppliedCode {
  return {
    id: row.code_id,
    name: row.name,
    codedBy:
      row.coded_by && row.coder_name
        ? { id: row.coded_by, name: row.coder_name, email: row.coder_email ?? '' }
        : null,
    codedAt: row.coded_at,
  };
}

export async function listCodes(db: Db, matterId: number): Promise<CodesResponse> {
  return { codes: (await listCodesWithCounts(db, matterId)).map(codeRowToApi) };
}

async function codeById(db: Db, matterId: number, codeId: number): Promise<Code> {
  const row = (await listCodesWithCounts(db, matterId)).find((c) => c.id === codeId);
  if (!row) throw notFound('Code');
  return codeRowToApi(row);
}

async function assertFree(
  db: Db,
  matterId: number,
  values: { name?: string; shortcut?: string | null },
  codeId?: number,
) {
  if (values.name !== undefined) {
    const clash = await findCodeByName(db, matterId, values.name);
    if (clash && clash.id !== codeId)
      throw conflict(`The matter already has a code named "${clash.name}".`, 'name');
  }
  if (values.shortcut) {
    const clash = await findCodeByShortcut(db, matterId, values.shortcut);
    if (clash && clash.id !== codeId)
      throw conflict(`The key "${values.shortcut}" already applies "${clash.name}".`, 'shortcut');
  }
}

export async function createCode(
  db: Db,
  matterId: number,
  input: CreateCodeReq,
  actor: Actor,
): Promise<Code> {
  const name = input.name;
  const shortcut = input.shortcut ?? null;
  await assertFree(db, matterId, { name, shortcut });
  const id = await db.transaction().execute(async (trx) => {
    const codeId = await insertCode(trx, {
      matterId,
      name,
      shortcut,
      marksPrivileged: input.marksPrivileged ?? false,
      sortOrder: await nextSortOrder(trx, matterId),
    });
    await recordAudit(trx, {
      ...auditActor(actor),
      matterId,
      action: 'code.created',
      targetType: 'code',
      targetId: codeId,
      detail: { name, shortcut, marksPrivileged: input.marksPrivileged ?? false },
    });
    return codeId;
  });
  return codeById(db, matterId, id);
}

export async function changeCode(
  db: Db,
  matterId: number,
  codeId: number,
  input: UpdateCodeReq,
  actor: Actor,
): Promise<Code> {
  const before = await findCode(db, matterId, codeId);
  if (!before) throw notFound('Code');
  await assertFree(db, matterId, input, codeId);
  const set: Parameters<typeof updateCode>[2] = {};
  if (input.name !== undefined) set.name = input.name;
  if (input.shortcut !== undefined) set.shortcut = input.shortcut;
  if (input.marksPrivileged !== undefined) set.marks_privileged = input.marksPrivileged ? 1 : 0;
  if (input.sortOrder !== undefined) set.sort_order = input.sortOrder;
  if (input.archived !== undefined)
    set.archived_at = input.archived ? (before.archived_at ?? new Date().toISOString()) : null;
  await db.transaction().execute(async (trx) => {
    await updateCode(trx, codeId, set);
    await recordAudit(trx, {
      ...auditActor(actor),
      matterId,
      action: input.archived === true && !before.archived_at ? 'code.archived' : 'code.updated',
      targetType: 'code',
      targetId: codeId,
      detail: {
        before: {
          name: before.name,
          shortcut: before.shortcut,
          marksPrivileged: before.marks_privileged === 1,
          sortOrder: before.sort_order,
          archived: before.archived_at !== null,
        },
        changes: input,
      },
    });
  });
  return codeById(db, matterId, codeId);
}

/** DELETE archives: the code stays on documents already coded (and in the audit log). */
export async function archiveCode(db: Db, matterId: number, codeId: number, actor: Actor) {
  return changeCode(db, matterId, codeId, { archived: true }, actor);
}

/** Applied codes per document, for search hits, the viewer and coding answers. */
export async function appliedCodesOf(db: Db, documentIds: number[]) {
  const byDoc = new Map<number, AppliedCode[]>();
  for (const id of documentIds) byDoc.set(id, []);
  for (const row of await listAppliedCodes(db, documentIds))
    byDoc.get(row.document_id)?.push(appliedRowToApi(row));
  return byDoc;
}

/** Checks that every code is the matter's; `forAdding` also refuses archived codes. */
async function checkCodes(
  db: Db,
  matterId: number,
  ids: number[],
  field: string,
  forAdding: boolean,
) {
  const unique = [...new Set(ids)];
  const rows = await findCodesByIds(db, matterId, unique);
  const found = new Map(rows.map((r) => [r.id, r]));
  const missing = unique.filter((id) => !found.has(id));
  if (missing.length > 0)
    throw validationError(field, `code ${missing.join(', ')} is not a code of this matter`);
  if (forAdding) {
    const archived = rows.filter((r) => r.archived_at !== null);
    if (archived.length > 0)
      throw validationError(field, `code "${archived[0].name}" is archived and cannot be applied`);
  }
  return unique;
}

async function checkDocuments(db: Db, matterId: number, ids: number[]) {
  const unique = [...new Set(ids)];
  const found = await existingDocumentIds(db, matterId, unique);
  const missing = unique.filter((id) => !found.has(id));
  if (missing.length > 0) {
    const shown = missing.slice(0, 10).join(', ');
    throw validationError(
      'documentIds',
      `document ${shown}${missing.length > 10 ? ', ...' : ''} is not in this matter`,
    );
  }
  return unique;
}

interface Change {
  documentId: number;
  added: number[];
  removed: number[];
}

/**
 * Applies add/remove per document in one transaction, writing ONE coding.changed audit
 * row per document whose codes changed (who, when, added, removed, the codes' names).
 */
async function applyChanges(
  db: Db,
  matterId: number,
  plan: (current: Map<number, Set<number>>) => Change[],
  documentIds: number[],
  actor: Actor,
  source: 'single' | 'bulk',
): Promise<Change[]> {
  return db.transaction().execute(async (trx) => {
    const current = new Map<number, Set<number>>();
    for (const id of documentIds) current.set(id, new Set());
    for (const row of await listAppliedCodes(trx, documentIds))
      current.get(row.document_id)?.add(row.code_id);
    const changes = plan(current).filter((c) => c.added.length + c.removed.length > 0);
    const at = new Date().toISOString();
    const names = new Map(
      (
        await findCodesByIds(trx, matterId, [
          ...new Set(changes.flatMap((c) => [...c.added, ...c.removed])),
        ])
      ).map((r) => [r.id, r.name]),
    );
    await addDocumentCodes(
      trx,
      changes.flatMap((c) => c.added.map((codeId) => ({ documentId: c.documentId, codeId }))),
      actor.id,
      at,
    );
    await removeDocumentCodes(
      trx,
      changes.flatMap((c) => c.removed.map((codeId) => ({ documentId: c.documentId, codeId }))),
    );
    for (const change of changes) {
      await recordAudit(trx, {
        ...auditActor(actor),
        matterId,
        action: 'coding.changed',
        targetType: 'document',
        targetId: change.documentId,
        detail: {
          added: change.added,
          removed: change.removed,
          addedNames: change.added.map((id) => names.get(id) ?? String(id)),
          removedNames: change.removed.map((id) => names.get(id) ?? String(id)),
          source,
        },
      });
    }
    return changes;
  });
}

/** PUT .../documents/:docId/codes: the document's codes become exactly codeIds. */
export async function setDocumentCodes(
  db: Db,
  matterId: number,
  documentId: number,
  codeIds: number[],
  actor: Actor,
): Promise<DocumentCodesResponse> {
  const found = await existingDocumentIds(db, matterId, [documentId]);
  if (!found.has(documentId)) throw notFound('Document');
  const wanted = new Set(await checkCodes(db, matterId, codeIds, 'codeIds', false));
  // Archived codes may stay on a document, but not be newly applied.
  const before = new Set(
    ((await appliedCodesOf(db, [documentId])).get(documentId) ?? []).map((c) => c.id),
  );
  const newlyAdded = [...wanted].filter((id) => !before.has(id));
  if (newlyAdded.length > 0) await checkCodes(db, matterId, newlyAdded, 'codeIds', true);
  const [change] = await applyChanges(
    db,
    matterId,
    (current) => {
      const now = current.get(documentId) ?? new Set<number>();
      return [
        {
          documentId,
          added: [...wanted].filter((id) => !now.has(id)),
          removed: [...now].filter((id) => !wanted.has(id)),
        },
      ];
    },
    [documentId],
    actor,
    'single',
  );
  const codes = (await appliedCodesOf(db, [documentId])).get(documentId) ?? [];
  return { documentId, codes, added: change?.added ?? [], removed: change?.removed ?? [] };
}

/** POST .../codes/bulk */
export async function bulkCode(
  db: Db,
  matterId: number,
  input: { documentIds: number[]; add: number[]; remove: number[] },
  actor: Actor,
): Promise<BulkCodingResponse> {
  const documentIds = await checkDocuments(db, matterId, input.documentIds);
  const add = await checkCodes(db, matterId, input.add, 'add', true);
  const remove = await checkCodes(db, matterId, input.remove, 'remove', false);
  const changes = await applyChanges(
    db,
    matterId,
    (current) =>
      documentIds.map((documentId) => {
        const now = current.get(documentId) ?? new Set<number>();
        return {
          documentId,
          added: add.filter((id) => !now.has(id)),
          removed: remove.filter((id) => now.has(id)),
        };
      }),
    documentIds,
    actor,
    'bulk',
  );
  const applied = await appliedCodesOf(db, documentIds);
  const documents: DocumentCoding[] = documentIds.map((documentId) => ({
    documentId,
    codes: applied.get(documentId) ?? [],
  }));
  return { changed: changes.length, unchanged: documentIds.length - changes.length, documents };
}
