/**
 * Every concept-space query of a matter sits under this key, so that a finished
 * rebuild (a new serving version) refreshes them all with one invalidation.
 */
export const conceptsQueryKey = (matterId: number) =>
  ['matters', 'detail', matterId, 'concepts'] as const;

export const conceptsPath = (matterId: number, rest: string) =>
  `/api/matters/${matterId}/concepts/${rest}`;
