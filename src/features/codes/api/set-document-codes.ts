import {
  type QueryClient,
  mutationOptions,
  useMutation,
  useQueryClient,
} from '@tanstack/react-query';
import type { DocumentCodesResponse, PrivilegeFieldsReq } from '@shared/schemas/codes';
import type { CodeRef } from '@shared/schemas/search';
import { api } from '@/lib/api-client';
import { batchesQueryKey } from '@/features/batches/api/keys';
import { reviewsQueryKey } from '@/features/review/api/keys';
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
  privilege?: PrivilegeFieldsReq,
): Promise<DocumentCodesResponse> {
  return api.put<DocumentCodesResponse>(`/api/matters/${matterId}/documents/${documentId}/codes`, {
    codeIds,
    privilege,
  });
}

export interface SetDocumentCodesVars {
  documentId: number;
  /** The full new set, in display order (names for the optimistic view). */
  codes: CodeRef[];
  /** Privilege type and basis, needed when a privilege code is newly chosen. */
  privilege?: PrivilegeFieldsReq;
}

/**
 * Optimistic: the new codes show at once; a refusal puts the old ones back and the
 * mutation's error says why. Changes in one matter run one after another (scope), so
 * the server sees them in the order they were made.
 */
export function setDocumentCodesMutationOptions(queryClient: QueryClient, matterId: number) {
  return mutationOptions<DocumentCodesResponse, Error, SetDocumentCodesVars, CodingSnapshot>({
    mutationFn: ({ documentId, codes, privilege }) =>
      setDocumentCodes(
        matterId,
        documentId,
        codes.map((code) => code.id),
        privilege,
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
    onSettled: async (answer, _error, vars) => {
      await queryClient.invalidateQueries({ queryKey: codesQueryKey(matterId) });
      // Family and duplicate propagation, the privilege entry and batch progress change too.
      if (answer?.propagated?.length || vars.privilege)
        await queryClient.invalidateQueries({ queryKey: reviewsQueryKey(matterId) });
      await queryClient.invalidateQueries({ queryKey: batchesQueryKey(matterId) });
    },
  });
}

export function useSetDocumentCodes(matterId: number) {
  const queryClient = useQueryClient();
  return useMutation(setDocumentCodesMutationOptions(queryClient, matterId));
}
