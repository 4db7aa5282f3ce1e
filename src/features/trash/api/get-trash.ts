import { queryOptions, useQuery } from '@tanstack/react-query';
import type { TrashResponse } from '@shared/schemas/trash';
import { api } from '@/lib/api-client';

export type { TrashItem, TrashResponse } from '@shared/schemas/trash';

/** Deleted coded documents waiting to be restored or purged (matter leads). */
export function getTrash(matterId: number, signal?: AbortSignal): Promise<TrashResponse> {
  return api.get<TrashResponse>(`/api/matters/${matterId}/trash`, { signal });
}

export const trashQueryKey = (matterId: number) =>
  ['matters', 'detail', matterId, 'trash'] as const;

export function trashQueryOptions(matterId: number) {
  return queryOptions({
    queryKey: trashQueryKey(matterId),
    queryFn: ({ signal }) => getTrash(matterId, signal),
  });
}

export function useTrash(matterId: number) {
  return useQuery(trashQueryOptions(matterId));
}
