import { z } from 'zod';
import { QUERY_MAX_LENGTH, SEARCH_PAGE_MAX } from '../limits';
import { idSchema, text } from './common';

// Search: POST /api/matters/:matterId/search, and "more like this".
//
// One request shape serves three things:
//  - a query:                     { query, mode, filters, ... }
//  - more like a document:        { similarTo: { documentId }, filters, ... }
//  - more like a selected passage: { similarTo: { passage }, filters, ... }
// GET /api/matters/:matterId/documents/:docId/similar is the same as
// { similarTo: { documentId: docId } } with the default filters, for a plain link.
// "More like this" always runs in the concept space (mode is reported as 'concept').

// 'prioritised': the learned ranking from the team's codes (server/prioritised); the
// query is optional there and, when given, keeps documents holding one of its words.
export const SEARCH_MODES = ['concept', 'keyword', 'hybrid', 'prioritised'] as const;
export type SearchMode = (typeof SEARCH_MODES)[number];

export const SORT_FIELDS = [
  'score',
  'controlNumber',
  'date',
  'title',
  'custodian',
  'docType',
  /** The top-level item's date, so an attachment sorts with its e-mail. */
  'familyDate',
] as const;
export type SortField = (typeof SORT_FIELDS)[number];

export const SEARCH_PAGE_DEFAULT = 50;
/** Most hits one result set holds (the export goes further: EXPORT_RESULTS_MAX in exports.ts). */
export const SEARCH_RESULT_SET_MAX = 10_000;
export const PASSAGE_MAX_LENGTH = QUERY_MAX_LENGTH;
export const FILTER_LIST_MAX = 500;

const isoDate = z
  .string({ error: 'must be a date (YYYY-MM-DD)' })
  .regex(/^\d{4}-\d{2}-\d{2}$/, 'must be a date (YYYY-MM-DD)')
  .refine((value) => !Number.isNaN(Date.parse(`${value}T00:00:00Z`)), 'is not a real date');

const idList = z
  .array(idSchema, { error: 'must be a list of ids' })
  .max(FILTER_LIST_MAX, `must list at most ${FILTER_LIST_MAX} ids`);

/** Filters apply to every mode (and to "more like this"). Dates are inclusive, UTC days. */
export const searchFiltersSchema = z
  .object({
    custodianIds: idList.optional(),
    dateFrom: isoDate.optional(),
    dateTo: isoDate.optional(),
    /** Which date dateFrom/dateTo test: the document's own (default) or its family's (the parent's). */
    dateBasis: z.enum(['document', 'family'], { error: 'must be document or family' }).optional(),
    /** pdf, docx, email, html, text, markdown, ... (documents.docType). */
    docTypes: z
      .array(z.string().min(1).max(40), { error: 'must be a list of document types' })
      .max(50, 'must list at most 50 types')
      .optional(),
    /** Documents carrying at least one of these codes. */
    codeIds: idList.optional(),
    /** Documents carrying no code at all. */
    uncodedOnly: z.boolean({ error: 'must be true or false' }).optional(),
    /** Exact duplicates (same SHA-256) are hidden by default; true lists each after its first copy. */
    includeDuplicates: z.boolean({ error: 'must be true or false' }).optional(),
    /** A concept group (k-means over the document vectors, server/concepts); an unknown id matches nothing. */
    groupId: idSchema.optional(),
  })
  .refine((f) => !(f.dateFrom && f.dateTo && f.dateFrom > f.dateTo), {
    message: 'dateFrom must not be after dateTo',
    path: ['dateFrom'],
  });
export type SearchFilters = z.infer<typeof searchFiltersSchema>;

export const searchSortSchema = z.object({
  field: z.enum(SORT_FIELDS, { error: `must be one of ${SORT_FIELDS.join(', ')}` }),
  direction: z.enum(['asc', 'desc'], { error: 'must be asc or desc' }).default('desc'),
});
export type SearchSort = z.infer<typeof searchSortSchema>;

export const similarToSchema = z.union(
  [
    z.object({ documentId: idSchema }).strict(),
    z
      .object({
        passage: text()
          .trim()
          .min(1, 'is required')
          .max(PASSAGE_MAX_LENGTH, `must be at most ${PASSAGE_MAX_LENGTH} characters`),
      })
      .strict(),
  ],
  { error: 'must be {documentId} or {passage}' },
);
export type SimilarTo = z.infer<typeof similarToSchema>;

export const searchRequestSchema = z
  .object({
    query: z
      .string({ error: 'must be text' })
      .max(QUERY_MAX_LENGTH, `must be at most ${QUERY_MAX_LENGTH} characters`)
      .optional(),
    mode: z
      .enum(SEARCH_MODES, { error: `must be one of ${SEARCH_MODES.join(', ')}` })
      .default('hybrid'),
    similarTo: similarToSchema.optional(),
    filters: searchFiltersSchema.default({}),
    limit: z
      .number({ error: 'must be a number' })
      .int('must be a whole number')
      .min(1, 'must be at least 1')
      .max(SEARCH_PAGE_MAX, `must be at most ${SEARCH_PAGE_MAX}`)
      .default(SEARCH_PAGE_DEFAULT),
    offset: z
      .number({ error: 'must be a number' })
      .int('must be a whole number')
      .min(0, 'must be 0 or more')
      .max(SEARCH_RESULT_SET_MAX, `must be at most ${SEARCH_RESULT_SET_MAX}`)
      .default(0),
    /** Default: score, best first. */
    sort: searchSortSchema.optional(),
    /** Set when re-running a saved search (recorded in the audit log). */
    savedSearchId: idSchema.optional(),
  })
  .refine(
    (r) =>
      (r.mode === 'prioritised' && r.similarTo === undefined) ||
      (r.query !== undefined && r.query.trim() !== '') !== (r.similarTo !== undefined),
    {
      message: 'give either a query or similarTo, not both',
      path: ['query'],
    },
  );
export type SearchReq = z.input<typeof searchRequestSchema>;
export type SearchParsedReq = z.output<typeof searchRequestSchema>;

/** GET /api/matters/:matterId/documents/:docId/similar?limit=&offset= */
export const similarQuerySchema = z.object({
  limit: z.coerce
    .number({ error: 'must be a number' })
    .int('must be a whole number')
    .min(1, 'must be at least 1')
    .max(SEARCH_PAGE_MAX, `must be at most ${SEARCH_PAGE_MAX}`)
    .default(20),
  offset: z.coerce
    .number({ error: 'must be a number' })
    .int('must be a whole number')
    .min(0, 'must be 0 or more')
    .max(SEARCH_RESULT_SET_MAX, `must be at most ${SEARCH_RESULT_SET_MAX}`)
    .default(0),
});
export type SimilarQueryReq = z.infer<typeof similarQuerySchema>;

/** A run of snippet text; `mark` says why it is highlighted. The client renders text, never HTML. */
export interface SnippetSegment {
  text: string;
  mark?: 'query' | 'concept';
}

export interface CodeRef {
  id: number;
  name: string;
}

export interface WhyMatched {
  /** The document's terms carrying most of its score (display words). */
  topTerms: { term: string; weight: number }[];
  /** The query's nearest terms in the concept space: one-click refinements. Empty in keyword mode without an index. */
  nearestQueryTerms: { term: string; similarity: number }[];
}

export interface SearchHit {
  documentId: number;
  controlNumber: string;
  title: string;
  custodian: string | null;
  sentAt: string | null;
  docType: string;
  /** 0..1 for the score bar (see rawScore). */
  score: number;
  /** Cosine (concept, more like this), bm25 with higher = better (keyword), fused 0..1 (hybrid). */
  rawScore: number;
  /** Rank by score, 1-based, whatever the sort. */
  rank: number;
  codes: CodeRef[];
  snippet: SnippetSegment[];
  why: WhyMatched;
  /** Set on a duplicate listed after its first copy (filters.includeDuplicates). */
  duplicateOf: number | null;
  parentId: number | null;
  /** Family, thread and near-duplicate group (see DocumentListItem); ocr: text from OCR. */
  // Optional in the type so hand-built hits (client tests) need not list them; the API sets them.
  familyId?: number;
  threadId?: number | null;
  inclusive?: boolean | null;
  nearDuplicateGroupId?: number | null;
  nearDuplicateSimilarity?: number | null;
  ocr?: boolean;
}

export interface SearchResponse {
  /** Hits in the whole result set (not just this page). */
  total: number;
  /** True when the result set stopped at SEARCH_RESULT_SET_MAX. */
  capped: boolean;
  /** Server time for the search, milliseconds. */
  tookMs: number;
  /** The mode that ran (hybrid becomes keyword, with a notice, before the first index build). */
  mode: SearchMode;
  limit: number;
  offset: number;
  sort: SearchSort;
  hits: SearchHit[];
  /** Query terms the concept index knows (analysed forms) / does not know (as typed). */
  knownTerms: string[];
  unknownTerms: string[];
  /** Plain-language notes: no known term, no index yet, result set capped, ... */
  notice?: string;
  /** Index version the concept part used; null for keyword-only. */
  indexVersion: number | null;
  /**
   * Set when the list is a concept ranking cut at a cosine (concept mode and "more like
   * this", for plain words): the hits are the documents at or above it, not "matches".
   */
  conceptCutoff?: number;
}
