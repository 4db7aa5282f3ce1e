import { z } from 'zod';
import type { AppliedCode } from './codes';
import { QUERY_MAX_LENGTH } from '../limits';
import { text, type PersonRef } from './common';
import type { DocumentRef } from './documents';
import { SEARCH_MODES } from './search';

// The document viewer: text with highlights, codes, notes, privilege entry, family.

export const NOTE_MAX_LENGTH = 10_000;
export const PRIVILEGE_BASIS_MAX_LENGTH = 200;
export const PRIVILEGE_DESCRIPTION_MAX_LENGTH = 2_000;
/** Longest text the viewer receives; the rest is cut (truncated: true) and stays downloadable. */
export const REVIEW_TEXT_MAX_CHARS = 2_000_000;

/** GET /api/matters/:matterId/documents/:docId/review?q=&mode= */
export const reviewQuerySchema = z.object({
  /** The search the reviewer came from: its terms (and concept-related terms) are highlighted. */
  q: z.string().max(QUERY_MAX_LENGTH, `must be at most ${QUERY_MAX_LENGTH} characters`).optional(),
  /** keyword: only the query's own terms are highlighted. Default hybrid. */
  mode: z
    .enum(SEARCH_MODES, { error: `must be one of ${SEARCH_MODES.join(', ')}` })
    .default('hybrid'),
});
export type ReviewQueryReq = z.infer<typeof reviewQuerySchema>;

/** [start, end) in UTF-16 code units of `text.body` (JavaScript string indices). */
export interface HighlightRange {
  start: number;
  end: number;
  mark: 'query' | 'concept';
}

export interface Note {
  id: number;
  body: string;
  author: PersonRef | null;
  createdAt: string;
}

export interface PrivilegeEntry {
  /** Attorney-client privilege, work product, common interest, or the lead's own. */
  type: string;
  basis: string;
  description: string;
  treatment: 'withheld' | 'redacted';
  updatedBy: PersonRef | null;
  updatedAt: string;
}

export interface ReviewDocument {
  id: number;
  controlNumber: string;
  title: string;
  name: string;
  docType: string;
  mime: string;
  custodian: { id: number; name: string } | null;
  author: string;
  recipients: string;
  /** Header fields as the message states them (RFC 5322 3.6), display text. */
  emailFrom: string;
  emailTo: string;
  emailCc: string;
  emailBcc: string;
  sentAt: string | null;
  familyId: number | null;
  /** Quality control checked this document: its coding changes only after the lead unlocks it. */
  locked: boolean;
  pageCount: number | null;
  size: number;
  status: string;
  parentId: number | null;
  duplicateOf: number | null;
}

/** Answer of GET .../documents/:docId/review (audited as document.viewed). */
export interface ReviewResponse {
  document: ReviewDocument;
  text: { title: string; body: string; truncated: boolean };
  highlights: HighlightRange[];
  /** Terms highlighted as 'concept' (display words), for a legend. */
  conceptTerms: string[];
  codes: AppliedCode[];
  notes: Note[];
  privilege: PrivilegeEntry | null;
  family: { parent: DocumentRef | null; attachments: DocumentRef[] };
  duplicates: DocumentRef[];
}

/** POST /api/matters/:matterId/documents/:docId/notes (documents.code) */
export const createNoteSchema = z.object({
  body: text()
    .trim()
    .min(1, 'is required')
    .max(NOTE_MAX_LENGTH, `must be at most ${NOTE_MAX_LENGTH} characters`),
});
export type CreateNoteReq = z.infer<typeof createNoteSchema>;

export interface NotesResponse {
  notes: Note[];
}

export interface NoteResponse {
  note: Note;
}

/** PUT /api/matters/:matterId/documents/:docId/privilege (documents.code) */
export const privilegeEntrySchema = z.object({
  type: text().trim().max(80, 'must be at most 80 characters').optional(),
  treatment: z.enum(['withheld', 'redacted'], { error: 'must be withheld or redacted' }).optional(),
  basis: text()
    .trim()
    .max(PRIVILEGE_BASIS_MAX_LENGTH, `must be at most ${PRIVILEGE_BASIS_MAX_LENGTH} characters`),
  description: text()
    .trim()
    .max(
      PRIVILEGE_DESCRIPTION_MAX_LENGTH,
      `must be at most ${PRIVILEGE_DESCRIPTION_MAX_LENGTH} characters`,
    ),
});
export type PrivilegeEntryReq = z.infer<typeof privilegeEntrySchema>;

export interface PrivilegeEntryResponse {
  privilege: PrivilegeEntry;
}
