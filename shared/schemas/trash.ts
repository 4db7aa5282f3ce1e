import { z } from 'zod';
import { idSchema, text } from './common';

// Deleting documents: DELETE .../documents/:docId takes an optional reason (required when
// the document or an attachment is coded; such a document goes to the trash). The trash
// lists them; a lead restores one or purges it (complete, irreversible deletion).

export const DELETE_REASON_MAX_LENGTH = 2000;

export const deleteDocumentSchema = z
  .object({
    reason: text()
      .trim()
      .max(DELETE_REASON_MAX_LENGTH, `must be at most ${DELETE_REASON_MAX_LENGTH} characters`)
      .optional(),
  })
  .optional();
export type DeleteDocumentReq = z.infer<typeof deleteDocumentSchema>;

export const trashParams = z.object({ matterId: idSchema, trashId: idSchema });

export interface TrashedCode {
  documentId: number;
  controlNumber: string;
  code: string;
}

export interface TrashItem {
  id: number;
  documentId: number;
  controlNumber: string;
  title: string;
  name: string;
  /** The document and its attachments. */
  documentCount: number;
  codes: TrashedCode[];
  reason: string;
  trashedBy: string | null;
  trashedAt: string;
}

export interface TrashResponse {
  items: TrashItem[];
}

/** DELETE .../documents/:docId answers 200 with what happened. */
export interface DeleteDocumentResponse {
  /** 'trashed': restorable from the trash; 'deleted': gone for good. */
  outcome: 'trashed' | 'deleted';
  trashId: number | null;
  documentCount: number;
}

export interface RestoreResponse {
  documentId: number;
  controlNumber: string;
  /** Rows that could not come back (e.g. a code or grouping deleted since). */
  skippedRows: number;
}

export interface PurgeResponse {
  documentId: number;
  controlNumber: string;
  /** Originals removed from the blob store (kept when another document still uses them). */
  blobsRemoved: number;
}
