import type { Response } from 'express';
import type { MatterRole } from '../../shared/roles';
import type {
  CreateCustodianResponse,
  CustodiansResponse,
  DocumentDetailResponse,
  DocumentListItem,
  DocumentRef,
  DocumentStatus,
  DocumentsPageResponse,
  DocumentsQueryReq,
  DocumentTextResponse,
  IndexState,
  RetryDocumentResponse,
} from '../../shared/schemas/documents';
import type { DeleteDocumentResponse } from '../../shared/schemas/trash';
import { recordAudit } from '../audit/record';
import type { AppContext } from '../context';
import type { DocumentRow } from '../db/schema';
import { conflict, notFound } from '../http/errors';
import { currentIndexIdOf } from '../indexing/queries';
import { removeDocument } from '../trash/service';
import type { Actor } from './ingest';
import {
  countDocumentsFiltered,
  findCustodianByName,
  findDocument,
  findDocumentRef,
  findDocumentText,
  findDocumentWithJoins,
  insertCustodian,
  listCustodians,
  listDocumentRefs,
  listDocumentsPage,
} from './queries';

type JoinedRow = DocumentRow & { custodian_name: string | null; index_folded_in: number | null };

const auditActor = (actor: Actor) => ({ actorId: actor.id, actorEmail: actor.email, ip: actor.ip });

function indexStateOf(row: JoinedRow): IndexState {
  if (row.extract_status === 'duplicate') return 'duplicate';
  if (row.extract_status === 'failed') return 'failed';
  if (row.index_folded_in === null || row.index_folded_in === undefined) return 'waiting';
  return row.index_folded_in ? 'folded' : 'indexed';
}

/** A documents row (with its joins) as the list shows it. */
export function documentRowToListItem(row: JoinedRow): DocumentListItem {
  return {
    id: row.id,
    controlNumber: row.control_number,
    title: row.title || row.original_name,
    name: row.original_name,
    path: row.original_path,
    custodian:
      row.custodian_id !== null ? { id: row.custodian_id, name: row.custodian_name ?? '' } : null,
    batchId: row.batch_id,
    docType: row.doc_type,
    mime: row.mime,
    size: row.size,
    sentAt: row.sent_at,
    author: row.author,
    pageCount: row.page_count,
    status: row.extract_status as DocumentStatus,
    error: row.extract_error,
    duplicateOf: row.duplicate_of,
    parentId: row.parent_id,
    indexState: indexStateOf(row),
    createdAt: row.created_at,
  };
}

function refOf(row: {
  id: number;
  control_number: string;
  title: string;
  original_name: string;
  extract_status: string;
}): DocumentRef {
  return {
    id: row.id,
    controlNumber: row.control_number,
    title: row.title || row.original_name,
    name: row.original_name,
    status: row.extract_status as DocumentStatus,
  };
}

export async function listDocuments(
  ctx: AppContext,
  matterId: number,
  query: DocumentsQueryReq,
): Promise<DocumentsPageResponse> {
  const indexId = await currentIndexIdOf(ctx.db, matterId);
  const filter = { status: query.status, custodian: query.custodian, batch: query.batch };
  const rows = await listDocumentsPage(ctx.db, matterId, indexId, filter, {
    limit: query.pageSize,
    offset: (query.page - 1) * query.pageSize,
  });
  return {
    documents: rows.map((row) => documentRowToListItem(row as JoinedRow)),
    total: await countDocumentsFiltered(ctx.db, matterId, filter),
    page: query.page,
    pageSize: query.pageSize,
  };
}

async function joinedDocument(ctx: AppContext, matterId: number, docId: number) {
  const indexId = await currentIndexIdOf(ctx.db, matterId);
  const row = await findDocumentWithJoins(ctx.db, matterId, docId, indexId);
  if (!row) throw notFound('Document');
  return row as JoinedRow;
}

export async function readDocument(
  ctx: AppContext,
  matterId: number,
  docId: number,
): Promise<DocumentDetailResponse> {
  const row = await joinedDocument(ctx, matterId, docId);
  const parent = row.parent_id !== null ? await findDocumentRef(ctx.db, row.parent_id) : undefined;
  const first =
    row.duplicate_of !== null ? await findDocumentRef(ctx.db, row.duplicate_of) : undefined;
  return {
    document: { ...documentRowToListItem(row), recipients: row.recipients, sha256: row.sha256 },
    family: {
      parent: parent ? refOf(parent) : null,
      attachments: (await listDocumentRefs(ctx.db, { parentId: row.id })).map(refOf),
    },
    duplicateOf: first ? refOf(first) : null,
    duplicates: (await listDocumentRefs(ctx.db, { duplicateOf: row.id })).map(refOf),
  };
}

export async function readDocumentText(
  ctx: AppContext,
  matterId: number,
  docId: number,
): Promise<DocumentTextResponse> {
  const row = await findDocument(ctx.db, matterId, docId);
  if (!row) throw notFound('Document');
  // A duplicate shows the first copy's text: it is the same content.
  const text = await findDocumentText(ctx.db, row.duplicate_of ?? row.id);
  return {
    id: row.id,
    controlNumber: row.control_number,
    title: text?.title || row.title || row.original_name,
    body: text?.body ?? '',
  };
}

/**
 * Streams the original file with Content-Disposition: attachment (RFC 6266; Express writes
 * the filename* parameter of RFC 8187 for names outside ISO-8859-1) and records the download.
 */
export async function sendOriginal(
  ctx: AppContext,
  res: Response,
  matterId: number,
  docId: number,
  actor: Actor,
): Promise<void> {
  const row = await findDocument(ctx.db, matterId, docId);
  if (!row) throw notFound('Document');
  if (!(await ctx.blobs.has(row.sha256))) throw notFound('Original file');
  await recordAudit(ctx.db, {
    ...auditActor(actor),
    matterId,
    action: 'document.original_downloaded',
    targetType: 'document',
    targetId: row.id,
    detail: { controlNumber: row.control_number, name: row.original_name },
  });
  res.attachment(row.original_name);
  res.type(row.mime || 'application/octet-stream');
  res.set('Content-Length', String(row.size));
  const stream = await ctx.blobs.read(row.sha256);
  await new Promise<void>((resolve, reject) => {
    stream.on('error', reject);
    res.on('finish', resolve);
    res.on('close', resolve);
    stream.pipe(res);
  });
}

/** Queues a failed document for extraction again. */
export async function retryDocument(
  ctx: AppContext,
  matterId: number,
  docId: number,
  actor: Actor,
): Promise<RetryDocumentResponse> {
  const row = await findDocument(ctx.db, matterId, docId);
  if (!row) throw notFound('Document');
  if (row.extract_status !== 'failed')
    throw conflict(
      `Only a failed document can be retried; ${row.control_number} is ${row.extract_status}.`,
    );
  if (row.doc_type === 'zip')
    throw conflict(
      `${row.control_number} is an archive that could not be expanded (${row.extract_error}); upload a corrected archive instead.`,
    );
  const jobId = await ctx.db.transaction().execute(async (trx) => {
    await trx
      .updateTable('documents')
      .set({ extract_status: 'pending', extract_error: null })
      .where('id', '=', docId)
      .execute();
    await recordAudit(trx, {
      ...auditActor(actor),
      matterId,
      action: 'document.retried',
      targetType: 'document',
      targetId: docId,
      detail: { controlNumber: row.control_number, previousError: row.extract_error },
    });
    return ctx.jobs.enqueue(trx, {
      matterId,
      kind: 'extract-batch',
      payload: { documentIds: [docId] },
      total: 1,
      createdBy: actor.id,
      message: `Waiting to retry ${row.control_number}`,
    });
  });
  ctx.jobs.wake('extract-batch');
  return { document: documentRowToListItem(await joinedDocument(ctx, matterId, docId)), jobId };
}

/**
 * Deletes a document with its attachments (server/trash: legal holds refuse it, a coded
 * document needs a reason and goes to the trash, any other is deleted completely).
 */
export function deleteDocument(
  ctx: AppContext,
  matterId: number,
  docId: number,
  role: MatterRole,
  actor: Actor,
  reason?: string,
): Promise<DeleteDocumentResponse> {
  return removeDocument(ctx, matterId, docId, role, actor, reason);
}

export async function readCustodians(
  ctx: AppContext,
  matterId: number,
): Promise<CustodiansResponse> {
  const rows = await listCustodians(ctx.db, matterId);
  return {
    custodians: rows.map((row) => ({
      id: row.id,
      name: row.name,
      documentCount: Number(row.document_count),
      createdAt: row.created_at,
    })),
  };
}

export async function createCustodian(
  ctx: AppContext,
  matterId: number,
  name: string,
  actor: Actor,
): Promise<CreateCustodianResponse> {
  return ctx.db.transaction().execute(async (trx) => {
    if (await findCustodianByName(trx, matterId, name))
      throw conflict(`This matter already has a custodian named ${name}.`, 'name');
    const row = await insertCustodian(trx, matterId, name);
    await recordAudit(trx, {
      ...auditActor(actor),
      matterId,
      action: 'custodian.created',
      targetType: 'custodian',
      targetId: row.id,
      detail: { name: row.name },
    });
    return {
      custodian: { id: row.id, name: row.name, documentCount: 0, createdAt: row.created_at },
    };
  });
}
