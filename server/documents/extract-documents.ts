// Extraction of loaded documents: text and metadata into documents and document_texts
// (whose triggers fill documents_fts), and e-mail attachments as child documents.
import path from 'node:path';
import { recordAudit } from '../audit/record';
import type { AppContext } from '../context';
import type { DocumentRow, ExtractStatus } from '../db/schema';
import type { ChildFile, ExtractSuccess } from '../extraction/types';
import { controlSequenceOf, formatControlNumber } from './control-numbers';
import {
  findDocumentsByIds,
  findFirstBySha,
  findMatterForLoad,
  insertDocument,
  replaceDocumentText,
  setExtractStatus,
  takeControlSequence,
} from './queries';

export interface ExtractOutcome {
  extracted: number[];
  failed: number[];
}

function recipientsText(result: ExtractSuccess): string {
  if (!result.recipients) return '';
  const { to, cc } = result.recipients;
  return [to && `To: ${to}`, cc && `Cc: ${cc}`].filter(Boolean).join('; ');
}

async function recordFailure(ctx: AppContext, doc: DocumentRow, reason: string): Promise<void> {
  await ctx.db.transaction().execute(async (trx) => {
    await setExtractStatus(trx, doc.id, 'failed', reason);
    await recordAudit(trx, {
      matterId: doc.matter_id,
      action: 'document.failed',
      targetType: 'document',
      targetId: doc.id,
      detail: { controlNumber: doc.control_number, path: doc.original_path, reason },
    });
  });
}

/** Stores attachments and records them as children of the e-mail, deduplicated by SHA-256. */
async function addChildren(
  ctx: AppContext,
  parent: DocumentRow,
  children: ChildFile[],
  reserved: number[],
): Promise<number[]> {
  if (children.length === 0) return [];
  const blobs: { sha256: string; size: number }[] = [];
  for (const child of children) blobs.push(await ctx.blobs.putBuffer(child.content));
  return ctx.db.transaction().execute(async (trx) => {
    const matter = await findMatterForLoad(trx, parent.matter_id);
    if (!matter) return [];
    const extra = Math.max(0, children.length - reserved.length);
    const firstExtra = extra > 0 ? await takeControlSequence(trx, parent.matter_id, extra) : 0;
    const pending: number[] = [];
    const now = new Date().toISOString();
    for (const [index, child] of children.entries()) {
      const seq = index < reserved.length ? reserved[index] : firstExtra + index - reserved.length;
      const blob = blobs[index];
      const first = await findFirstBySha(trx, parent.matter_id, blob.sha256);
      const status: ExtractStatus = first ? 'duplicate' : 'pending';
      const name = path.posix.basename(child.name) || `attachment-${index + 1}`;
      const id = await insertDocument(trx, {
        matter_id: parent.matter_id,
        batch_id: parent.batch_id,
        custodian_id: parent.custodian_id,
        parent_id: parent.id,
        control_number: formatControlNumber(matter.control_prefix, seq),
        original_name: name,
        original_path: `${parent.original_path}/${name}`,
        sha256: blob.sha256,
        mime: child.contentType,
        doc_type: 'unknown',
        size: blob.size,
        sent_at: parent.sent_at,
        page_count: null,
        extract_status: status,
        extract_error: null,
        duplicate_of: first?.id ?? null,
        created_at: now,
      });
      if (status === 'pending') pending.push(id);
    }
    return pending;
  });
}

/**
 * Extracts one document (and, for an e-mail, its attachments, recursively). A failure is
 * recorded on that document only; documents loaded before are never touched.
 */
async function extractOne(
  ctx: AppContext,
  doc: DocumentRow,
  reserved: number[],
  outcome: ExtractOutcome,
): Promise<void> {
  if (doc.extract_status !== 'pending' && doc.extract_status !== 'extracting') return;
  await setExtractStatus(ctx.db, doc.id, 'extracting');
  let result;
  try {
    result = await ctx.extraction.extract(ctx.blobs.pathOf(doc.sha256), doc.original_name, {
      maxFileBytes: ctx.config.upload.maxFileBytes,
    });
  } catch (error) {
    ctx.logger.error({ err: error, documentId: doc.id }, 'extraction threw');
    result = { ok: false as const, reason: 'file could not be read' };
  }
  if (!result.ok) {
    await recordFailure(ctx, doc, result.reason);
    outcome.failed.push(doc.id);
    return;
  }
  const title = result.title ?? '';
  await ctx.db.transaction().execute(async (trx) => {
    await trx
      .updateTable('documents')
      .set({
        title,
        author: result.author ?? '',
        recipients: recipientsText(result),
        sent_at: result.sentAt ?? result.createdAt,
        page_count: result.pageCount,
        doc_type: result.kind,
        mime: result.mime,
        extract_status: 'extracted',
        extract_error: null,
      })
      .where('id', '=', doc.id)
      .execute();
    await replaceDocumentText(trx, doc.id, title, result.text);
  });
  outcome.extracted.push(doc.id);
  const childIds = await addChildren(
    ctx,
    { ...doc, sent_at: result.sentAt },
    result.attachments,
    reserved,
  );
  for (const child of await findDocumentsByIds(ctx.db, childIds)) {
    await extractOne(ctx, child, [], outcome);
  }
}

export interface ExtractProgress {
  (done: number, total: number, current: string): Promise<void> | void;
}

/** Extracts the given documents in order; the rest go on when one fails. */
export async function extractDocuments(
  ctx: AppContext,
  documentIds: number[],
  options: {
    reserved?: Record<string, number[]>;
    signal?: AbortSignal;
    onProgress?: ExtractProgress;
  } = {},
): Promise<ExtractOutcome> {
  const outcome: ExtractOutcome = { extracted: [], failed: [] };
  const docs = await findDocumentsByIds(ctx.db, documentIds);
  for (const [index, doc] of docs.entries()) {
    if (options.signal?.aborted) break;
    await options.onProgress?.(index, docs.length, doc.original_path || doc.original_name);
    try {
      await extractOne(ctx, doc, options.reserved?.[String(doc.id)] ?? [], outcome);
    } catch (error) {
      ctx.logger.error({ err: error, documentId: doc.id }, 'could not extract a document');
      await recordFailure(ctx, doc, 'file could not be read').catch(() => undefined);
      outcome.failed.push(doc.id);
    }
  }
  await options.onProgress?.(docs.length, docs.length, '');
  return outcome;
}

export { controlSequenceOf };
