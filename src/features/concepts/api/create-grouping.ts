import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { CreateGroupingReq, GroupingResponse } from '@shared/schemas/concepts';
import { api } from '@/lib/api-client';
import { groupingQueryOptions } from './get-grouping';
import { groupingsQueryKey } from './get-groupings';
import { conceptsPath } from './keys';

/** POST .../concepts/groupings: k-means over the document vectors (the same seed gives the same groups). */
export function createGrouping(
  matterId: number,
  body: CreateGroupingReq,
): Promise<GroupingResponse> {
  return api.post<GroupingResponse>(conceptsPath(matterId, 'groupings'), body);
}

export function useCreateGrouping(matterId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: CreateGroupingReq) => createGrouping(matterId, body),
    onSuccess: async (result) => {
      queryClient.setQueryData(groupingQueryOptions(matterId, result.grouping.id).queryKey, result);
      await queryClient.invalidateQueries({ queryKey: [...groupingsQueryKey(matterId), 'list'] });
    },
  });
}
