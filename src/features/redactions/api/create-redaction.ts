import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { CreateRedactionReq, Redaction } from '@shared/schemas/productions';
import { api } from '@/lib/api-client';
import { redactionKeys } from '../keys';

/** POST /api/matters/:matterId/documents/:docId/redactions (documents.redact). */
export function createRedaction(matterId: number, documentId: number, body: CreateRedactionReq) {
  return api.post<{ redaction: Redaction }>(
    `/api/matters/${matterId}/documents/${documentId}/redactions`,
    body,
  );
}

export function useCreateRedaction(matterId: number, documentId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: CreateRedactionReq) => createRedaction(matterId, documentId, body),
    onSuccess: () =>
      queryClient.invalidateQueries({ queryKey: redactionKeys.document(matterId, documentId) }),
  });
}
