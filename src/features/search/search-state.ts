import {
  SEARCH_MODES,
  SEARCH_PAGE_DEFAULT,
  SORT_FIELDS,
  type SearchFilters,
  type SearchMode,
  type SearchReq,
  type SearchSort,
  type SortField,
} from '@shared/schemas/search';

/**
 * What a search screen shows, kept in the address bar so a search can be bookmarked,
 * shared with a colleague on the matter, and re-created by the viewer (which uses the
 * same request, hence the same cached page, to step to the next document).
 *
 * q, mode, cust=1,2  from=YYYY-MM-DD  to=  types=pdf,email  codes=3,4  uncoded=1  dups=1
 * sort=<field>  dir=asc|desc  page=<1-based>  size=<rows>  like=<docId>  passage=<text>  saved=<id>
 */
export interface SearchState {
  query: string;
  mode: SearchMode;
  filters: SearchFilters;
  sort?: SearchSort;
  /** 0-based. */
  pageIndex: number;
  pageSize: number;
  /** "More like this" from a document. */
  likeDocumentId?: number;
  /** "More like this" from a passage. */
  passage?: string;
  savedSearchId?: number;
}

export const PAGE_SIZES = [50, 100, 250] as const;

function ids(raw: string | null): number[] | undefined {
  if (!raw) return undefined;
  const list = raw
    .split(',')
    .map(Number)
    .filter((n) => Number.isInteger(n) && n > 0);
  return list.length ? list : undefined;
}

function positive(raw: string | null): number | undefined {
  const n = Number(raw);
  return Number.isInteger(n) && n > 0 ? n : undefined;
}

const isoDay = /^\d{4}-\d{2}-\d{2}$/;

export function parseSearchState(params: URLSearchParams): SearchState {
  const mode = params.get('mode');
  const sortField = params.get('sort');
  const filters: SearchFilters = {};
  const custodianIds = ids(params.get('cust'));
  if (custodianIds) filters.custodianIds = custodianIds;
  const codeIds = ids(params.get('codes'));
  if (codeIds) filters.codeIds = codeIds;
  const from = params.get('from');
  if (from && isoDay.test(from)) filters.dateFrom = from;
  const to = params.get('to');
  if (to && isoDay.test(to)) filters.dateTo = to;
  const types = params.get('types')?.split(',').filter(Boolean);
  if (types?.length) filters.docTypes = types;
  if (params.get('uncoded') === '1') filters.uncodedOnly = true;
  if (params.get('dups') === '1') filters.includeDuplicates = true;
  const groupId = positive(params.get('group'));
  if (groupId) filters.groupId = groupId;
  const size = positive(params.get('size'));
  return {
    query: params.get('q') ?? '',
    mode: (SEARCH_MODES as readonly string[]).includes(mode ?? '')
      ? (mode as SearchMode)
      : 'hybrid',
    filters,
    sort: (SORT_FIELDS as readonly string[]).includes(sortField ?? '')
      ? {
          field: sortField as SortField,
          direction: params.get('dir') === 'asc' ? 'asc' : 'desc',
        }
      : undefined,
    pageIndex: (positive(params.get('page')) ?? 1) - 1,
    pageSize: PAGE_SIZES.includes(size as (typeof PAGE_SIZES)[number])
      ? (size as number)
      : SEARCH_PAGE_DEFAULT,
    likeDocumentId: positive(params.get('like')),
    passage: params.get('passage') || undefined,
    savedSearchId: positive(params.get('saved')),
  };
}

export function searchStateToParams(state: SearchState): URLSearchParams {
  const params = new URLSearchParams();
  if (state.likeDocumentId) params.set('like', String(state.likeDocumentId));
  else if (state.passage) params.set('passage', state.passage);
  else if (state.query) params.set('q', state.query);
  if (state.mode !== 'hybrid') params.set('mode', state.mode);
  const f = state.filters;
  if (f.custodianIds?.length) params.set('cust', f.custodianIds.join(','));
  if (f.dateFrom) params.set('from', f.dateFrom);
  if (f.dateTo) params.set('to', f.dateTo);
  if (f.docTypes?.length) params.set('types', f.docTypes.join(','));
  if (f.codeIds?.length) params.set('codes', f.codeIds.join(','));
  if (f.uncodedOnly) params.set('uncoded', '1');
  if (f.includeDuplicates) params.set('dups', '1');
  if (f.groupId) params.set('group', String(f.groupId));
  if (state.sort) {
    params.set('sort', state.sort.field);
    params.set('dir', state.sort.direction);
  }
  if (state.pageIndex > 0) params.set('page', String(state.pageIndex + 1));
  if (state.pageSize !== SEARCH_PAGE_DEFAULT) params.set('size', String(state.pageSize));
  if (state.savedSearchId) params.set('saved', String(state.savedSearchId));
  return params;
}

/** True when the state names something to search for. */
export function hasSearch(state: SearchState): boolean {
  return Boolean(state.likeDocumentId || state.passage || state.query.trim());
}

/** The POST .../search body for one page of the state's result set (null: nothing to run). */
export function searchRequestFor(
  state: SearchState,
  pageIndex = state.pageIndex,
): SearchReq | null {
  if (!hasSearch(state)) return null;
  const base = {
    filters: state.filters,
    limit: state.pageSize,
    offset: pageIndex * state.pageSize,
    ...(state.sort ? { sort: state.sort } : {}),
  };
  if (state.likeDocumentId)
    return { ...base, mode: 'concept', similarTo: { documentId: state.likeDocumentId } };
  if (state.passage) return { ...base, mode: 'concept', similarTo: { passage: state.passage } };
  return {
    ...base,
    query: state.query,
    mode: state.mode,
    ...(state.savedSearchId ? { savedSearchId: state.savedSearchId } : {}),
  };
}

export const MODE_LABELS: Record<SearchMode, string> = {
  concept: 'Concept',
  keyword: 'Keyword',
  hybrid: 'Hybrid',
};

/** One line each, shown under the mode switch. */
export const MODE_EXPLANATIONS: Record<SearchMode, string> = {
  concept:
    'Finds documents about the same thing, even when they use other words (latent semantic indexing).',
  keyword: 'Finds documents containing your words (after stemming), ranked by BM25.',
  hybrid: 'Blends both rankings: documents with your words and documents about the same thing.',
};

export function searchHref(matterId: number, state: SearchState): string {
  const text = searchStateToParams(state).toString();
  return `/matters/${matterId}/search${text ? `?${text}` : ''}`;
}

/** The viewer's address for the hit at absolute position `position` of the state's result set. */
export function reviewHref(
  matterId: number,
  documentId: number,
  state: SearchState | null,
  position?: number,
): string {
  if (!state || !hasSearch(state)) return `/matters/${matterId}/review/${documentId}`;
  const params = searchStateToParams(state);
  params.delete('page');
  if (position !== undefined) params.set('pos', String(position));
  return `/matters/${matterId}/review/${documentId}?${params.toString()}`;
}
