import { queryOptions, useQuery } from '@tanstack/react-query';
import type { RedactionsResponse } from '@shared/schemas/productions';
import { api } from '@/lib/api-client';
import { redactionKeys } from '../keys';

export type { Redaction } from '@shared/schemas/productions';

/** GET /api/matters/:matterId/documents/:docId/redactions */
export function getRedactions(matterId: number, documentId: number, signal?: AbortSignal) {
  return api.get<RedactionsResponse>(
    `/api/matters/${matterId}/documents/${documentId}/redactions`,
    { signal },
  );
}

export function redactionsQueryOptions(matterId: number, documentId: number) {
  return queryOptions({
    queryKey: redactionKeys.document(matterId, documentId),
    queryFn: ({ signal }) => getRedactions(matterId, documentId, signal),
  });
}

export function useRedactions(matterId: number, documentId: number) {
  return useQuery(redactionsQueryOptions(matterId, documentId));
}
