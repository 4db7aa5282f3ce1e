import { queryOptions, useQuery } from '@tanstack/react-query';
import type { ThreadResponse } from '../../../../shared/schemas/relationships';
import { api } from '../../../lib/api-client';
import { documentsQueryKey } from './get-documents';

/** The document's e-mail thread as a tree in reading order, with inclusive flags. */
export function getDocumentThread(matterId: number, docId: number, signal?: AbortSignal) {
  return api.get<ThreadResponse>(`/api/matters/${matterId}/documents/${docId}/thread`, { signal });
}

export function documentThreadQueryOptions(matterId: number, docId: number) {
  return queryOptions({
    queryKey: [...documentsQueryKey(matterId), 'thread', docId],
    queryFn: ({ signal }) => getDocumentThread(matterId, docId, signal),
  });
}

export function useDocumentThread(matterId: number, docId: number, enabled = true) {
  return useQuery({ ...documentThreadQueryOptions(matterId, docId), enabled });
}
