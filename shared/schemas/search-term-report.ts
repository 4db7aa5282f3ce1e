import { z } from 'zod';
import { searchFiltersSchema } from './search';

// Search term report: POST /api/matters/:matterId/search-term-report (JSON) and
// POST /api/matters/:matterId/search-term-report.csv (the same report as CSV, audited as
// an export). Each term is a query in the search query language (docs/SEARCH.md).

export const TERM_REPORT_MAX_TERMS = 200;
export const TERM_MAX_LENGTH = 2000;

export const termReportRequestSchema = z.object({
  terms: z
    .array(
      z
        .string({ error: 'must be text' })
        .max(TERM_MAX_LENGTH, `each term must be at most ${TERM_MAX_LENGTH} characters`),
      { error: 'must be a list of search terms' },
    )
    .min(1, 'must list at least one term')
    .max(TERM_REPORT_MAX_TERMS, `must list at most ${TERM_REPORT_MAX_TERMS} terms`),
  filters: searchFiltersSchema.default({}),
});
export type TermReportReq = z.input<typeof termReportRequestSchema>;
export type TermReportParsedReq = z.output<typeof termReportRequestSchema>;

export interface TermReportRow {
  term: string;
  /** Documents the term hits. */
  documents: number;
  /** Hits no other term of the report has. */
  uniqueDocuments: number;
  /** Hits plus their family members (parent e-mail, attachments). */
  withFamilies: number;
  /** Hits per custodian who held a copy (document_custodians), most first. */
  byCustodian: { custodian: string; documents: number }[];
  /** Set when the term is not a valid query: the message, with its position. */
  error?: string;
}

export interface TermReportResponse {
  rows: TermReportRow[];
  /** Documents any term hits, and with their families. */
  total: { documents: number; withFamilies: number };
}

export const TERM_REPORT_CSV_COLUMNS = [
  'Term',
  'Documents',
  'Unique documents',
  'With families',
  'Error',
] as const;
