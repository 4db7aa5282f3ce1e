import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { DocumentStatus, DocumentsPageResponse } from '@shared/schemas/documents';
import { api } from '@/lib/api-client';

export type {
  DocumentListItem,
  DocumentsPageResponse,
  DocumentStatus,
  IndexState,
} from '@shared/schemas/documents';

/** The query string of GET /api/matters/:matterId/documents (shared/schemas/documents.ts). */
export interface DocumentFilters {
  page: number;
  pageSize: number;
  status?: DocumentStatus;
  /** Custodian id. */
  custodian?: number;
  /** Upload batch id. */
  batch?: number;
}

export function getDocuments(
  matterId: number,
  filters: DocumentFilters,
  signal?: AbortSignal,
): Promise<DocumentsPageResponse> {
  return api.get<DocumentsPageResponse>(`/api/matters/${matterId}/documents`, {
    signal,
    query: {
      page: filters.page,
      pageSize: filters.pageSize,
      status: filters.status,
      custodian: filters.custodian,
      batch: filters.batch,
    },
  });
}

/** True while a document still waits for, or is in, extraction. */
export function isInFlight(status: DocumentStatus): boolean {
  return status === 'pending' || status === 'extracting';
}

export const documentsQueryKey = (matterId: number) =>
  ['matters', 'detail', matterId, 'documents'] as const;

export function documentsQueryOptions(matterId: number, filters: DocumentFilters) {
  return queryOptions({
    queryKey: [...documentsQueryKey(matterId), 'list', filters],
    queryFn: ({ signal }) => getDocuments(matterId, filters, signal),
    placeholderData: keepPreviousData,
    staleTime: 5_000,
    // While any listed document is being extracted its row changes on the server: poll.
    refetchInterval: (query) =>
      query.state.data?.documents.some((document) => isInFlight(document.status)) ? 1_500 : false,
  });
}

export function useDocuments(matterId: number, filters: DocumentFilters) {
  return useQuery(documentsQueryOptions(matterId, filters));
}
