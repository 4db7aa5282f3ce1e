import { useCallback, useEffect } from 'react';
import type { IndexStateResponse } from '@shared/schemas/indexing';

// The spectrum answer carries no build time; the index state does, for the serving
// version only. Remembering it per index version for the browser session lets the
// comparison show the old build's time beside the new one after a rebuild.
const storageKey = (indexId: number) => `quarry.index-build-ms.${indexId}`;

function remembered(indexId: number): number | null {
  try {
    const raw = window.sessionStorage.getItem(storageKey(indexId));
    const value = raw == null ? NaN : Number(raw);
    return Number.isFinite(value) ? value : null;
  } catch {
    return null;
  }
}

export function useBuildTimes(state: IndexStateResponse | undefined) {
  const current = state?.current ?? null;
  const currentId = current?.id ?? null;
  const currentMs = current?.diagnostics.buildMs ?? null;
  useEffect(() => {
    if (currentId == null || currentMs == null) return;
    try {
      window.sessionStorage.setItem(storageKey(currentId), String(currentMs));
    } catch {
      // Storage may be unavailable (private mode); the figure is then shown as unknown.
    }
  }, [currentId, currentMs]);
  return useCallback(
    (indexId: number) => (indexId === currentId ? currentMs : remembered(indexId)),
    [currentId, currentMs],
  );
}
