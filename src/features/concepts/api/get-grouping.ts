import { queryOptions, useQuery } from '@tanstack/react-query';
import type { GroupingResponse } from '@shared/schemas/concepts';
import { api } from '@/lib/api-client';
import { groupingsQueryKey } from './get-groupings';
import { conceptsPath } from './keys';

export type { ConceptGroup, GroupTerm, GroupingResponse } from '@shared/schemas/concepts';

/** One grouping with its groups (size, top terms). */
export function getGrouping(
  matterId: number,
  groupingId: number,
  signal?: AbortSignal,
): Promise<GroupingResponse> {
  return api.get<GroupingResponse>(conceptsPath(matterId, `groupings/${groupingId}`), {
    signal,
  });
}

export function groupingQueryOptions(matterId: number, groupingId: number) {
  return queryOptions({
    queryKey: [...groupingsQueryKey(matterId), 'detail', groupingId],
    queryFn: ({ signal }) => getGrouping(matterId, groupingId, signal),
  });
}

export function useGrouping(matterId: number, groupingId: number | null) {
  return useQuery({
    ...groupingQueryOptions(matterId, groupingId ?? 0),
    enabled: groupingId != null,
  });
}
