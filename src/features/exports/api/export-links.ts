import type { SearchFilters, SearchMode, SearchSort } from '@shared/schemas/search';

// The CSV exports are plain GET downloads (Content-Disposition: attachment), so the
// browser saves them itself; the server audits each one.

/** GET /api/matters/:matterId/exports/results.csv for the search on screen. */
export function resultsCsvHref(
  matterId: number,
  search: { query: string; mode: SearchMode; filters: SearchFilters; sort?: SearchSort },
): string {
  const params = new URLSearchParams({ query: search.query, mode: search.mode });
  if (Object.keys(search.filters).length > 0) params.set('filters', JSON.stringify(search.filters));
  if (search.sort) {
    params.set('sort', search.sort.field);
    params.set('direction', search.sort.direction);
  }
  return `/api/matters/${matterId}/exports/results.csv?${params.toString()}`;
}

/** GET /api/matters/:matterId/exports/privilege-log.csv: documents coded with a privilege code. */
export function privilegeLogCsvHref(matterId: number): string {
  return `/api/matters/${matterId}/exports/privilege-log.csv`;
}
