import { queryOptions, useQuery } from '@tanstack/react-query';
import type { GroupingsListResponse } from '@shared/schemas/concepts';
import { api } from '@/lib/api-client';
import { conceptsPath, conceptsQueryKey } from './keys';

export type { GroupingSummary, GroupingsListResponse } from '@shared/schemas/concepts';

/** The k-means groupings already run on the serving version. */
export function getGroupings(
  matterId: number,
  signal?: AbortSignal,
): Promise<GroupingsListResponse> {
  return api.get<GroupingsListResponse>(conceptsPath(matterId, 'groupings'), { signal });
}

export const groupingsQueryKey = (matterId: number) =>
  [...conceptsQueryKey(matterId), 'groupings'] as const;

export function groupingsQueryOptions(matterId: number) {
  return queryOptions({
    queryKey: [...groupingsQueryKey(matterId), 'list'],
    queryFn: ({ signal }) => getGroupings(matterId, signal),
  });
}

export function useGroupings(matterId: number) {
  return useQuery(groupingsQueryOptions(matterId));
}
