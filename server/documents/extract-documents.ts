// Extraction of loaded documents: text and metadata into documents and document_texts
// (whose triggers fill documents_fts), and e-mail attachments as child documents.
import { createHash } from 'node:crypto';
import path from 'node:path';
import { recordAudit } from '../audit/record';
import type { AppContext } from '../context';
import type { DocumentRow, ExtractStatus } from '../db/schema';
import type { ChildFile, ExtractSuccess } from '../extraction/types';
import { matterPasswords } from '../passwords/service';
import { refreshRelationships } from '../relationships/service';
import { signatureOfText, signatureToBytes } from '../relationships/minhash';
import { addressesOf } from '../relationships/threads';
import { controlSequenceOf, formatControlNumber } from './control-numbers';
import {
  addCustodiansOfCopy,
  findDocumentsByIds,
  findFirstByEmailHash,
  findMatterForLoad,
  inheritCustodians,
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

/**
 * SHA-256 of an e-mail's normalised header fields and body: addresses lower-cased and
 * sorted per field, the subject and body with spacing collapsed, the date to the second.
 * The same message collected from two mailboxes (different bytes: other Received lines,
 * another folder) hashes the same. Message-ID is left out: stores rewrite or drop it.
 */
export function emailHashOf(result: ExtractSuccess): string | null {
  if (!result.email) return null;
  const list = (display: string) => addressesOf(display).sort().join(',');
  const squash = (text: string | null) => (text ?? '').replace(/\s+/g, ' ').trim();
  const parts = [
    list(result.email.from),
    list(result.email.to),
    list(result.email.cc),
    list(result.email.bcc),
    squash(result.title).toLowerCase(),
    result.sentAt ? result.sentAt.slice(0, 19) : '',
    squash(result.text),
  ];
  return createHash('sha256').update(parts.join('\u0000')).digest('hex');
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

/**
 * Stores attachments and records them as children of the e-mail. De-duplication treats the
 * family as the unit: an attachment is never suppressed as a copy of a document in another
 * family (it stays with its parent); a family whose top-level item is a copy is suppressed
 * whole, since a duplicate is not extracted and so gets no children. Beyond the nesting
 * limit children are kept and recorded as failed, never dropped.
 */
async function addChildren(
  ctx: AppContext,
  parent: DocumentRow,
  children: ChildFile[],
  reserved: number[],
  depth: number,
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
      const tooDeep = depth > ctx.config.upload.maxArchiveDepth;
      const status: ExtractStatus = tooDeep ? 'failed' : 'pending';
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
        extract_error: tooDeep ? 'archive nesting too deep' : null,
        duplicate_of: null,
        created_at: now,
      });
      await inheritCustodians(trx, parent.id, id);
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
  depth = 1,
): Promise<void> {
  if (doc.extract_status !== 'pending' && doc.extract_status !== 'extracting') return;
  await setExtractStatus(ctx.db, doc.id, 'extracting');
  let result;
  try {
    result = await ctx.extraction.extract(ctx.blobs.pathOf(doc.sha256), doc.original_name, {
      maxFileBytes: ctx.config.upload.maxFileBytes,
      passwords: await matterPasswords(ctx, doc.matter_id),
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
  const emailHash = emailHashOf(result);
  const email = result.email;
  // A top-level e-mail already held (same normalised headers and body, other bytes) is a
  // duplicate of the first copy; its custodian joins the first copy's custodians.
  const firstCopy =
    emailHash && doc.parent_id === null
      ? await findFirstByEmailHash(ctx.db, doc.matter_id, emailHash, doc.id)
      : undefined;
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
        extract_status: firstCopy ? 'duplicate' : 'extracted',
        extract_error: null,
        duplicate_of: firstCopy?.id ?? null,
        email_from: email?.from ?? '',
        email_to: email?.to ?? '',
        email_cc: email?.cc ?? '',
        email_bcc: email?.bcc ?? '',
        message_id: email?.messageId ?? null,
        in_reply_to: email?.inReplyTo ?? null,
        email_references: email?.references ?? '',
        received_at: email?.receivedAt ?? null,
        file_created_at: result.createdAt,
        file_modified_at: result.modifiedAt,
        last_author: result.lastAuthor ?? '',
        ocr: result.ocr ? 1 : 0,
        email_hash: emailHash,
      })
      .where('id', '=', doc.id)
      .execute();
    if (firstCopy) {
      await addCustodiansOfCopy(trx, firstCopy.id, doc.id);
      return;
    }
    await replaceDocumentText(trx, doc.id, title, result.text);
    await trx
      .insertInto('document_minhash')
      .values({
        document_id: doc.id,
        signature: signatureToBytes(signatureOfText(`${title}\n${result.text}`)),
      })
      .onConflict((oc) =>
        oc.column('document_id').doUpdateSet((eb) => ({ signature: eb.ref('excluded.signature') })),
      )
      .execute();
  });
  if (firstCopy) return;
  outcome.extracted.push(doc.id);
  const childIds = await addChildren(
    ctx,
    { ...doc, sent_at: result.sentAt },
    result.attachments,
    reserved,
    depth,
  );
  for (const child of await findDocumentsByIds(ctx.db, childIds)) {
    await extractOne(ctx, child, [], outcome, depth + 1);
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
  // Threads and near-duplicate groups follow the matter's documents.
  for (const matterId of new Set(docs.map((d) => d.matter_id))) {
    try {
      await refreshRelationships(ctx, matterId);
    } catch (error) {
      ctx.logger.error({ err: error, matterId }, 'could not refresh threads and near-duplicates');
    }
  }
  await options.onProgress?.(docs.length, docs.length, '');
  return outcome;
}

export { controlSequenceOf };
