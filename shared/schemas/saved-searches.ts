import { z } from 'zod';
import { QUERY_MAX_LENGTH } from '../limits';
import { idSchema, text, type PersonRef } from './common';
import { SEARCH_MODES, searchFiltersSchema, type SearchFilters, type SearchMode } from './search';

// Saved searches per matter (saved by searches.save, re-run by anyone with search.run:
// the client posts { query, mode, filters, savedSearchId } to POST .../search) and each
// person's recent searches (from the audit log).

export const SAVED_SEARCH_NAME_MAX_LENGTH = 120;
export const RECENT_SEARCHES_MAX = 20;

export const savedSearchParams = z.object({ matterId: idSchema, savedSearchId: idSchema });
export type SavedSearchParams = z.infer<typeof savedSearchParams>;

/** POST /api/matters/:matterId/saved-searches */
export const createSavedSearchSchema = z.object({
  name: text()
    .trim()
    .min(1, 'is required')
    .max(
      SAVED_SEARCH_NAME_MAX_LENGTH,
      `must be at most ${SAVED_SEARCH_NAME_MAX_LENGTH} characters`,
    ),
  query: text()
    .trim()
    .min(1, 'is required')
    .max(QUERY_MAX_LENGTH, `must be at most ${QUERY_MAX_LENGTH} characters`),
  mode: z
    .enum(SEARCH_MODES, { error: `must be one of ${SEARCH_MODES.join(', ')}` })
    .default('hybrid'),
  filters: searchFiltersSchema.default({}),
});
export type CreateSavedSearchReq = z.input<typeof createSavedSearchSchema>;

export interface SavedSearch {
  id: number;
  name: string;
  query: string;
  mode: SearchMode;
  filters: SearchFilters;
  createdBy: PersonRef | null;
  createdAt: string;
}

/** GET /api/matters/:matterId/saved-searches (search.run), newest first. */
export interface SavedSearchesResponse {
  savedSearches: SavedSearch[];
}

export interface SavedSearchResponse {
  savedSearch: SavedSearch;
}

export interface RecentSearch {
  /** Empty for a "more like this" search. */
  query: string;
  mode: SearchMode;
  filters: SearchFilters;
  /** documentId for "more like this" from a document. */
  similarToDocumentId: number | null;
  hits: number;
  at: string;
}

/** GET /api/matters/:matterId/searches/recent: the caller's last 20 distinct searches, newest first. */
export interface RecentSearchesResponse {
  searches: RecentSearch[];
}
