import {
  type QueryClient,
  mutationOptions,
  useMutation,
  useQueryClient,
} from '@tanstack/react-query';
import type { DocumentCodesResponse } from '@shared/schemas/codes';
import type { CodeRef } from '@shared/schemas/search';
import { api } from '@/lib/api-client';
import { codesQueryKey } from './get-codes';
import {
  type CodingSnapshot,
  patchCachedCoding,
  restoreCoding,
  snapshotCoding,
} from './patch-cached-coding';

/** PUT /api/matters/:matterId/documents/:docId/codes: the document's full code set. */
export function setDocumentCodes(
  matterId: number,
  documentId: number,
  codeIds: number[],
): Promise<DocumentCodesResponse> {
  return api.put<DocumentCodesResponse>(`/api/matters/${matterId}/documents/${documentId}/codes`, {
    codeIds,
  });
}

export interface SetDocumentCodesVars {
  documentId: number;
  /** The full new set, in display order (names for the optimistic view). */
  codes: CodeRef[];
}

/**
 * Optimistic: the new codes show at once; a refusal puts the old ones back and the
 * mutation's error says why. Changes in one matter run one after another (scope), so
 * the server sees them in the order they were made.
 */
export function setDocumentCodesMutationOptions(queryClient: QueryClient, matterId: number) {
  return mutationOptions<DocumentCodesResponse, Error, SetDocumentCodesVars, CodingSnapshot>({
    mutationFn: ({ documentId, codes }) =>
      setDocumentCodes(
        matterId,
        documentId,
        codes.map((code) => code.id),
      ),
    scope: { id: `coding-${matterId}` },
    onMutate: async ({ documentId, codes }) => {
      const snapshot = await snapshotCoding(queryClient, matterId);
      patchCachedCoding(queryClient, matterId, new Map([[documentId, codes]]));
      return snapshot;
    },
    onError: (_error, _vars, snapshot) => {
      if (snapshot) restoreCoding(queryClient, snapshot);
    },
    onSuccess: (answer) => {
      patchCachedCoding(
        queryClient,
        matterId,
        new Map([[answer.documentId, answer.codes.map(({ id, name }) => ({ id, name }))]]),
      );
    },
    onSettled: () => queryClient.invalidateQueries({ queryKey: codesQueryKey(matterId) }),
  });
}

export function useSetDocumentCodes(matterId: number) {
  const queryClient = useQueryClient();
  return useMutation(setDocumentCodesMutationOptions(queryClient, matterId));
}
