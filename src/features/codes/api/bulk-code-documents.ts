import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { BulkCodingReq, BulkCodingResponse } from '@shared/schemas/codes';
import { api } from '@/lib/api-client';
import { codesQueryKey } from './get-codes';
import { patchCachedCoding } from './patch-cached-coding';

/** POST /api/matters/:matterId/codes/bulk: add and remove codes on many documents. */
export function bulkCodeDocuments(
  matterId: number,
  body: BulkCodingReq,
): Promise<BulkCodingResponse> {
  return api.post<BulkCodingResponse>(`/api/matters/${matterId}/codes/bulk`, body);
}

/** Not optimistic: a bulk change may be large, so rows change when the server has agreed. */
export function useBulkCodeDocuments(matterId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: BulkCodingReq) => bulkCodeDocuments(matterId, body),
    scope: { id: `coding-${matterId}` },
    onSuccess: (answer) => {
      patchCachedCoding(
        queryClient,
        matterId,
        new Map(
          answer.documents.map((doc) => [
            doc.documentId,
            doc.codes.map(({ id, name }) => ({ id, name })),
          ]),
        ),
      );
      return queryClient.invalidateQueries({ queryKey: codesQueryKey(matterId) });
    },
  });
}
