import { queryOptions, useQuery } from '@tanstack/react-query';
import type { DocumentDetailResponse } from '@shared/schemas/documents';
import { api } from '@/lib/api-client';
import { documentsQueryKey, isInFlight } from './get-documents';

export type { DocumentDetailResponse, DocumentRef } from '@shared/schemas/documents';

/** A document's metadata, its family (parent e-mail and attachments) and its duplicates. */
export function getDocument(
  matterId: number,
  docId: number,
  signal?: AbortSignal,
): Promise<DocumentDetailResponse> {
  return api.get<DocumentDetailResponse>(`/api/matters/${matterId}/documents/${docId}`, {
    signal,
  });
}

export function documentQueryOptions(matterId: number, docId: number) {
  return queryOptions({
    queryKey: [...documentsQueryKey(matterId), 'detail', docId],
    queryFn: ({ signal }) => getDocument(matterId, docId, signal),
    refetchInterval: (query) =>
      query.state.data && isInFlight(query.state.data.document.status) ? 1_500 : false,
  });
}

export function useDocument(matterId: number, docId: number) {
  return useQuery(documentQueryOptions(matterId, docId));
}

/** Where the stored original is served (Content-Disposition: attachment). */
export function documentOriginalHref(matterId: number, docId: number): string {
  return `/api/matters/${matterId}/documents/${docId}/original`;
}
