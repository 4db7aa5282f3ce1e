import { useSearch } from '../search/api/run-search';
import { type SearchState, reviewHref, searchRequestFor } from '../search/search-state';

export interface ReviewPosition {
  /** 0-based position in the result set. */
  position: number;
  total: number;
  previousHref: string | null;
  nextHref: string | null;
}

/**
 * Where the open document sits in the result list it was opened from. The pages are the
 * same requests the search screen made (same cache entries); the neighbouring page is
 * fetched only when the next or previous document lies on it.
 */
export function useReviewPosition(
  matterId: number,
  state: SearchState | null,
  position: number | null,
): ReviewPosition | null {
  const size = state?.pageSize ?? 50;
  const pos = position ?? 0;
  const pageOf = (p: number) => Math.floor(Math.max(0, p) / size);
  const usable = state !== null && position !== null;
  const here = useSearch(matterId, usable ? searchRequestFor(state, pageOf(pos)) : null);
  const total = here.data?.total ?? 0;
  const before = useSearch(
    matterId,
    usable && pos > 0 && pageOf(pos - 1) !== pageOf(pos)
      ? searchRequestFor(state, pageOf(pos - 1))
      : null,
  );
  const after = useSearch(
    matterId,
    usable && here.data && pos + 1 < total && pageOf(pos + 1) !== pageOf(pos)
      ? searchRequestFor(state, pageOf(pos + 1))
      : null,
  );
  if (!usable || !here.data) return null;

  function hrefAt(p: number): string | null {
    if (p < 0 || p >= total) return null;
    const page =
      pageOf(p) === pageOf(pos) ? here.data : pageOf(p) < pageOf(pos) ? before.data : after.data;
    const hit = page?.hits[p - pageOf(p) * size];
    return hit ? reviewHref(matterId, hit.documentId, state, p) : null;
  }
  return { position: pos, total, previousHref: hrefAt(pos - 1), nextHref: hrefAt(pos + 1) };
}
