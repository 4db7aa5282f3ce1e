import { PRIVILEGE_LOG_COLUMNS } from './privilege-log';
import { z } from 'zod';
import { QUERY_MAX_LENGTH } from '../limits';
import { SEARCH_MODES, SORT_FIELDS, searchFiltersSchema } from './search';

// CSV exports, for roles with exports.create. Both answer text/csv
// (RFC 4180: CRLF line ends, fields with commas, quotes or line breaks quoted, quotes
// doubled) in UTF-8 with a byte-order mark (so spreadsheet programs read UTF-8), as
// an attachment. A cell starting with = + - @ (or tab/CR) gets a leading apostrophe
// (OWASP "CSV Injection" guidance), so a spreadsheet never runs it as a formula.

/** Most rows one results export holds. */
export const EXPORT_RESULTS_MAX = 200_000;

/** GET /api/matters/:matterId/exports/results.csv?query=&mode=&filters=<json>&sort=&direction= */
export const resultsExportQuerySchema = z.object({
  query: z
    .string({ error: 'is required' })
    .trim()
    .min(1, 'is required')
    .max(QUERY_MAX_LENGTH, `must be at most ${QUERY_MAX_LENGTH} characters`),
  mode: z
    .enum(SEARCH_MODES, { error: `must be one of ${SEARCH_MODES.join(', ')}` })
    .default('hybrid'),
  /** JSON of the search's filters (the same object POST .../search takes). */
  filters: z
    .string()
    .max(100_000)
    .optional()
    .transform((raw, ctx) => {
      if (raw === undefined || raw === '') return {};
      try {
        return JSON.parse(raw) as unknown;
      } catch {
        ctx.addIssue({ code: 'custom', message: 'must be JSON' });
        return z.NEVER;
      }
    })
    .pipe(searchFiltersSchema),
  sort: z.enum(SORT_FIELDS, { error: `must be one of ${SORT_FIELDS.join(', ')}` }).optional(),
  direction: z.enum(['asc', 'desc'], { error: 'must be asc or desc' }).optional(),
});
export type ResultsExportQueryReq = z.input<typeof resultsExportQuerySchema>;

/** Column headers, in order. */
export const RESULTS_CSV_COLUMNS = [
  'Rank',
  'Control number',
  'Title',
  'Custodian',
  'Date',
  'Document type',
  'Score',
  'Codes',
  // Collection metadata (issue 13), after the original columns so existing layouts hold.
  'Family ID',
  'Family date',
  'From',
  'To',
  'Cc',
  'Bcc',
  'Sent',
  'Received',
  'Message-ID',
  'In-Reply-To',
  'File created',
  'File modified',
  'Author',
  'Last author',
  'Source path',
  'All custodians',
  'Thread ID',
  'Inclusive',
  'Near-duplicate group',
  'Near-duplicate similarity',
  'OCR',
] as const;

/** The privilege log's columns (shared/schemas/privilege-log.ts), in order. */
export const PRIVILEGE_LOG_CSV_COLUMNS = PRIVILEGE_LOG_COLUMNS.map(([, label]) => label);

/** Codes in a results row are joined with this. */
export const CODES_SEPARATOR = '; ';
