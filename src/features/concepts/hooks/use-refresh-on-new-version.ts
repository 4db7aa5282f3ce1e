import { useQueryClient } from '@tanstack/react-query';
import { useEffect, useRef } from 'react';
import { useIndexState } from '@/features/indexing/api/get-index-state';
import { conceptsQueryKey } from '../api/keys';

/**
 * Follows the index state (which polls itself while a build runs) and, when a new
 * version starts serving, refetches every concept-space query of the matter: the
 * spectrum, dimensions, map, groups and health all belong to one version.
 */
export function useRefreshOnNewVersion(matterId: number) {
  const queryClient = useQueryClient();
  const state = useIndexState(matterId);
  const servingId = state.data?.current?.id ?? null;
  const seen = useRef<number | null>(null);
  useEffect(() => {
    if (servingId == null) return;
    if (seen.current != null && seen.current !== servingId) {
      void queryClient.invalidateQueries({ queryKey: conceptsQueryKey(matterId) });
    }
    seen.current = servingId;
  }, [servingId, matterId, queryClient]);
  return state;
}
