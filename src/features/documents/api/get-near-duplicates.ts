import { queryOptions, useQuery } from '@tanstack/react-query';
import type { NearDuplicatesResponse } from '../../../../shared/schemas/relationships';
import { api } from '../../../lib/api-client';
import { documentsQueryKey } from './get-documents';

/** The document's near-duplicate group: the principal and each member's similarity. */
export function getNearDuplicates(matterId: number, docId: number, signal?: AbortSignal) {
  return api.get<NearDuplicatesResponse>(
    `/api/matters/${matterId}/documents/${docId}/near-duplicates`,
    { signal },
  );
}

export function nearDuplicatesQueryOptions(matterId: number, docId: number) {
  return queryOptions({
    queryKey: [...documentsQueryKey(matterId), 'near-duplicates', docId],
    queryFn: ({ signal }) => getNearDuplicates(matterId, docId, signal),
  });
}

export function useNearDuplicates(matterId: number, docId: number, enabled = true) {
  return useQuery({ ...nearDuplicatesQueryOptions(matterId, docId), enabled });
}
