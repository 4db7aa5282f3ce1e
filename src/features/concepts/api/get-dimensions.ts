import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { DimensionsQuery, DimensionsResponse } from '@shared/schemas/concepts';
import { api } from '@/lib/api-client';
import { conceptsPath, conceptsQueryKey } from './keys';

export type {
  ConceptDimension,
  DimensionDocument,
  DimensionTerm,
  DimensionsResponse,
} from '@shared/schemas/concepts';

/** The leading concept dimensions: strongest terms at both ends, typical documents, labels. */
export function getDimensions(
  matterId: number,
  query: DimensionsQuery,
  signal?: AbortSignal,
): Promise<DimensionsResponse> {
  return api.get<DimensionsResponse>(conceptsPath(matterId, 'dimensions'), {
    signal,
    query: { count: query.count, terms: query.terms, docs: query.docs },
  });
}

export const dimensionsQueryKey = (matterId: number) =>
  [...conceptsQueryKey(matterId), 'dimensions'] as const;

export function dimensionsQueryOptions(matterId: number, query: DimensionsQuery) {
  return queryOptions({
    queryKey: [...dimensionsQueryKey(matterId), query],
    queryFn: ({ signal }) => getDimensions(matterId, query, signal),
    placeholderData: keepPreviousData,
  });
}

export function useDimensions(matterId: number, query: DimensionsQuery) {
  return useQuery(dimensionsQueryOptions(matterId, query));
}
