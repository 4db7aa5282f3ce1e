import type { QueryClient } from '@tanstack/react-query';
import type { CodeRef } from '@shared/schemas/search';
import type { ReviewResponse } from '@shared/schemas/review';
import type { SearchResponse } from '@shared/schemas/search';
import { reviewsQueryKey } from '@/features/review/api/keys';
import { searchesQueryKey } from '@/features/search/api/keys';

/** A snapshot of every cached query a coding change touches, for rollback. */
export type CodingSnapshot = [readonly unknown[], unknown][];

/**
 * Writes new code lists into the cached search hits and review documents, so a change
 * shows at once everywhere without re-running (and re-auditing) the searches.
 */
export function patchCachedCoding(
  queryClient: QueryClient,
  matterId: number,
  codesByDocument: Map<number, CodeRef[]>,
): void {
  queryClient.setQueriesData<SearchResponse>({ queryKey: searchesQueryKey(matterId) }, (old) =>
    old
      ? {
          ...old,
          hits: old.hits.map((hit) =>
            codesByDocument.has(hit.documentId)
              ? { ...hit, codes: codesByDocument.get(hit.documentId) ?? [] }
              : hit,
          ),
        }
      : old,
  );
  for (const [documentId, codes] of codesByDocument) {
    queryClient.setQueriesData<ReviewResponse>(
      { queryKey: [...reviewsQueryKey(matterId), documentId] },
      (old) => {
        if (!old) return old;
        const kept = new Map(old.codes.map((code) => [code.id, code]));
        return {
          ...old,
          codes: codes.map(
            (code) =>
              kept.get(code.id) ?? {
                id: code.id,
                name: code.name,
                codedBy: null,
                codedAt: new Date().toISOString(),
              },
          ),
        };
      },
    );
  }
}

export async function snapshotCoding(
  queryClient: QueryClient,
  matterId: number,
): Promise<CodingSnapshot> {
  await queryClient.cancelQueries({ queryKey: reviewsQueryKey(matterId) });
  return [
    ...queryClient.getQueriesData({ queryKey: searchesQueryKey(matterId) }),
    ...queryClient.getQueriesData({ queryKey: reviewsQueryKey(matterId) }),
  ];
}

export function restoreCoding(queryClient: QueryClient, snapshot: CodingSnapshot): void {
  for (const [key, data] of snapshot) queryClient.setQueryData(key, data);
}
