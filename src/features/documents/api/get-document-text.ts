import { queryOptions, useQuery } from '@tanstack/react-query';
import type { DocumentTextResponse } from '@shared/schemas/documents';
import { api } from '@/lib/api-client';
import { documentsQueryKey } from './get-documents';

export type { DocumentTextResponse } from '@shared/schemas/documents';

/** The extracted text of a document (what the index and keyword search read). */
export function getDocumentText(
  matterId: number,
  docId: number,
  signal?: AbortSignal,
): Promise<DocumentTextResponse> {
  return api.get<DocumentTextResponse>(`/api/matters/${matterId}/documents/${docId}/text`, {
    signal,
  });
}

export function documentTextQueryOptions(matterId: number, docId: number) {
  return queryOptions({
    queryKey: [...documentsQueryKey(matterId), 'text', docId],
    queryFn: ({ signal }) => getDocumentText(matterId, docId, signal),
    staleTime: 5 * 60_000,
  });
}

export function useDocumentText(matterId: number, docId: number, enabled = true) {
  return useQuery({ ...documentTextQueryOptions(matterId, docId), enabled });
}
