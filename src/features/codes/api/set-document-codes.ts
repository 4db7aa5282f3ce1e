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

/** Every coding change of a matter, for counting the ones still queued behind each other. */
export const setDocumentCodesMutationKey = (matterId: number) =>
  ['matters', 'detail', matterId, 'set-codes'] as const;

/** Matters whose cached review documents need a refetch once their coding queue drains. */
const staleReviews = new WeakMap<QueryClient, Set<number>>();

/** Changes to `documentId` still pending in the queue (the one finishing counts itself). */
function pendingFor(queryClient: QueryClient, matterId: number, documentId: number): number {
  return queryClient.isMutating({
    mutationKey: setDocumentCodesMutationKey(matterId),
    predicate: (m) =>
      (m.state.variables as SetDocumentCodesVars | undefined)?.documentId === documentId,
  });
}

/**
 * Optimistic: the new codes show at once; a refusal puts the old ones back and the
 * mutation's error says why. Changes in one matter run one after another (scope), so
 * the server sees them in the order they were made. A server answer is written back only
 * when no later change to the same document is queued: otherwise the earlier answer would
 * overwrite the later choice on screen until that one came back too.
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
    mutationKey: setDocumentCodesMutationKey(matterId),
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
      if (pendingFor(queryClient, matterId, answer.documentId) > 1) return;
      patchCachedCoding(
        queryClient,
        matterId,
        new Map([[answer.documentId, answer.codes.map(({ id, name }) => ({ id, name }))]]),
      );
    },
    onSettled: async (answer, _error, vars) => {
      await queryClient.invalidateQueries({ queryKey: codesQueryKey(matterId) });
      // Family and duplicate propagation, the privilege entry and batch progress change too.
      // The review refetch waits for the queue to drain, or it would bring back a state
      // older than the choices still queued.
      const stale = staleReviews.get(queryClient) ?? new Set<number>();
      staleReviews.set(queryClient, stale);
      if (answer?.propagated?.length || vars.privilege) stale.add(matterId);
      const queued = queryClient.isMutating({ mutationKey: setDocumentCodesMutationKey(matterId) });
      if (queued <= 1 && stale.delete(matterId))
        await queryClient.invalidateQueries({ queryKey: reviewsQueryKey(matterId) });
      await queryClient.invalidateQueries({ queryKey: batchesQueryKey(matterId) });
    },
  });
}

export function useSetDocumentCodes(matterId: number) {
  const queryClient = useQueryClient();
  return useMutation(setDocumentCodesMutationOptions(queryClient, matterId));
}
