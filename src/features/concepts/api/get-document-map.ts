import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { MapQuery, MapResponse } from '@shared/schemas/concepts';
import { api } from '@/lib/api-client';
import { conceptsPath, conceptsQueryKey } from './keys';

export type { MapLookup, MapResponse } from '@shared/schemas/concepts';

/** Every document of the serving version as a point on two concept dimensions. */
export function getDocumentMap(
  matterId: number,
  query: MapQuery,
  signal?: AbortSignal,
): Promise<MapResponse> {
  return api.get<MapResponse>(conceptsPath(matterId, 'map'), {
    signal,
    query: { x: query.x, y: query.y },
  });
}

export function documentMapQueryOptions(matterId: number, query: MapQuery) {
  return queryOptions({
    queryKey: [...conceptsQueryKey(matterId), 'map', query],
    queryFn: ({ signal }) => getDocumentMap(matterId, query, signal),
    placeholderData: keepPreviousData,
  });
}

export function useDocumentMap(matterId: number, query: MapQuery) {
  return useQuery(documentMapQueryOptions(matterId, query));
}
