import { queryOptions, useQuery } from '@tanstack/react-query';
import type { ReviewResponse } from '@shared/schemas/review';
import type { SearchMode } from '@shared/schemas/search';
import { api } from '@/lib/api-client';
import { reviewsQueryKey } from './keys';

export type { ReviewResponse } from '@shared/schemas/review';

export interface ReviewHighlightFor {
  /** The search the reviewer came from; its terms are highlighted. */
  q?: string;
  mode: SearchMode;
}

/** GET /api/matters/:matterId/documents/:docId/review?q=&mode= (audited as a view). */
export function getReview(
  matterId: number,
  docId: number,
  highlight: ReviewHighlightFor,
  signal?: AbortSignal,
): Promise<ReviewResponse> {
  return api.get<ReviewResponse>(`/api/matters/${matterId}/documents/${docId}/review`, {
    signal,
    query: { q: highlight.q, mode: highlight.mode },
  });
}

export function reviewQueryOptions(matterId: number, docId: number, highlight: ReviewHighlightFor) {
  return queryOptions({
    queryKey: [...reviewsQueryKey(matterId), docId, highlight],
    queryFn: ({ signal }) => getReview(matterId, docId, highlight, signal),
    staleTime: 30_000,
    refetchOnWindowFocus: false,
  });
}

export function useReview(matterId: number, docId: number, highlight: ReviewHighlightFor) {
  return useQuery(reviewQueryOptions(matterId, docId, highlight));
}
