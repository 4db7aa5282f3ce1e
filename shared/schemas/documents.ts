import { z } from 'zod';
import { NAME_MAX_LENGTH } from '../limits';
import { idSchema, text } from './common';

// Documents in: upload batches, the document list and detail, custodians.

export const DOCUMENT_STATUSES = [
  'pending',
  'extracting',
  'extracted',
  'failed',
  'duplicate',
] as const;
export type DocumentStatus = (typeof DOCUMENT_STATUSES)[number];

/**
 * Where a document stands in the matter's concept space: in the built space ('indexed'),
 * added since by folding-in ('folded'), not yet in it ('waiting'), or never to be
 * ('failed' extraction, 'duplicate' of another document).
 */
export const INDEX_STATES = ['indexed', 'folded', 'waiting', 'failed', 'duplicate'] as const;
export type IndexState = (typeof INDEX_STATES)[number];

export const documentParams = z.object({ matterId: idSchema, docId: idSchema });
export type DocumentParams = z.infer<typeof documentParams>;

export const custodianNameSchema = text()
  .trim()
  .min(1, 'is required')
  .max(NAME_MAX_LENGTH, `must be at most ${NAME_MAX_LENGTH} characters`);

/**
 * POST /api/matters/:matterId/documents is multipart/form-data (RFC 7578): files in the
 * field `files` (repeated), and these text fields.
 */
export const uploadFieldsSchema = z.object({
  /** Custodian name; created when the matter has none by that name (case-insensitive). */
  custodian: custodianNameSchema.optional(),
});
export type UploadFieldsReq = z.infer<typeof uploadFieldsSchema>;

export interface CustodianRef {
  id: number;
  name: string;
}

/** One file of an upload batch as the upload answer lists it. */
export interface UploadedFile {
  id: number;
  /** File name as uploaded (for an archive entry: its own name). */
  name: string;
  /** Path inside the upload: the name, or "archive.zip/folder/memo.pdf" for an archive entry. */
  path: string;
  controlNumber: string;
  status: DocumentStatus;
  /** Document id of the first copy when this file is an exact duplicate. */
  duplicateOf?: number;
  duplicateOfControlNumber?: string;
  /** Why the file failed (status 'failed'), worded for a paralegal. */
  error?: string;
}

/** An archive entry that was left out (operating-system metadata, links, oversize entries). */
export interface SkippedFile {
  path: string;
  reason: string;
}

/** 201 answer of POST /api/matters/:matterId/documents: the batch. */
export interface UploadBatchResponse {
  id: number;
  custodian: CustodianRef | null;
  files: UploadedFile[];
  skipped: SkippedFile[];
  /** The extraction job (GET /api/jobs/:jobId for progress); null when nothing needs extracting. */
  jobId: number | null;
}

export const DOCUMENTS_PAGE_DEFAULT = 50;
export const DOCUMENTS_PAGE_MAX = 500;

/** GET /api/matters/:matterId/documents?page=&pageSize=&status=&custodian=&batch= */
export const documentsQuerySchema = z.object({
  page: z.coerce
    .number({ error: 'must be a number' })
    .int('must be a whole number')
    .min(1, 'must be at least 1')
    .default(1),
  pageSize: z.coerce
    .number({ error: 'must be a number' })
    .int('must be a whole number')
    .min(1, 'must be at least 1')
    .max(DOCUMENTS_PAGE_MAX, `must be at most ${DOCUMENTS_PAGE_MAX}`)
    .default(DOCUMENTS_PAGE_DEFAULT),
  status: z
    .enum(DOCUMENT_STATUSES, { error: `must be one of ${DOCUMENT_STATUSES.join(', ')}` })
    .optional(),
  /** Custodian id. */
  custodian: idSchema.optional(),
  /** Upload batch id. */
  batch: idSchema.optional(),
  /** Only inclusive e-mails (and every document that is not an e-mail). */
  inclusiveOnly: z
    .enum(['true', 'false'], { error: 'must be true or false' })
    .transform((v) => v === 'true')
    .optional(),
  /** Near-duplicate group (the principal document's id). */
  nearDuplicateGroup: idSchema.optional(),
  /** Thread (the id of its first message). */
  thread: idSchema.optional(),
});
export type DocumentsQueryReq = z.infer<typeof documentsQuerySchema>;

export interface DocumentListItem {
  id: number;
  controlNumber: string;
  /** Title or subject; the file name when the document has none. */
  title: string;
  name: string;
  path: string;
  custodian: CustodianRef | null;
  batchId: number | null;
  /** pdf, docx, email, html, text, markdown, zip, unknown. */
  docType: string;
  mime: string;
  size: number;
  sentAt: string | null;
  author: string;
  pageCount: number | null;
  status: DocumentStatus;
  error: string | null;
  duplicateOf: number | null;
  parentId: number | null;
  indexState: IndexState;
  createdAt: string;
  /** The top-level document of this one's family (its own id when top-level). */
  familyId: number;
  /** The top-level item's date: an attachment sorts with its e-mail. */
  familyDate: string | null;
  /** The thread's first message (e-mail only). */
  threadId: number | null;
  /** E-mail: true when no later reply of its branch contains it; null for other documents. */
  inclusive: boolean | null;
  /** Near-duplicate group (its principal's id) and the estimated Jaccard resemblance to it. */
  nearDuplicateGroupId: number | null;
  nearDuplicateSimilarity: number | null;
  /** Every custodian who held a copy (this document's and its de-duplicated copies'). */
  allCustodians: CustodianRef[];
  /** True when the text came from OCR. */
  ocr: boolean;
  // E-mail header fields (RFC 5322 3.6), display text "Name <addr>, ...".
  emailFrom: string;
  emailTo: string;
  emailCc: string;
  emailBcc: string;
  messageId: string | null;
  inReplyTo: string | null;
  references: string;
  receivedAt: string | null;
  // File metadata.
  fileCreatedAt: string | null;
  fileModifiedAt: string | null;
  lastAuthor: string;
}

export interface DocumentsPageResponse {
  documents: DocumentListItem[];
  total: number;
  page: number;
  pageSize: number;
}

export interface DocumentRef {
  id: number;
  controlNumber: string;
  title: string;
  name: string;
  status: DocumentStatus;
}

/** GET /api/matters/:matterId/documents/:docId */
export interface DocumentDetailResponse {
  document: DocumentListItem & {
    recipients: string;
    sha256: string;
  };
  family: { parent: DocumentRef | null; attachments: DocumentRef[] };
  /** The first copy (when this is a duplicate) and the recorded duplicates of this one. */
  duplicateOf: DocumentRef | null;
  duplicates: DocumentRef[];
}

/** GET /api/matters/:matterId/documents/:docId/text */
export interface DocumentTextResponse {
  id: number;
  controlNumber: string;
  title: string;
  body: string;
}

/** POST .../documents/:docId/retry (202): the document, now pending, and the job. */
export interface RetryDocumentResponse {
  document: DocumentListItem;
  jobId: number;
}

export interface Custodian {
  id: number;
  name: string;
  documentCount: number;
  createdAt: string;
}

/** GET /api/matters/:matterId/custodians */
export interface CustodiansResponse {
  custodians: Custodian[];
}

/** POST /api/matters/:matterId/custodians */
export const createCustodianSchema = z.object({ name: custodianNameSchema });
export type CreateCustodianReq = z.infer<typeof createCustodianSchema>;

export interface CreateCustodianResponse {
  custodian: Custodian;
}
