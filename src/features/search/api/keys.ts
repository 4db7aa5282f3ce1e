/** Every cached search result set of a matter sits under this key (coding patches them in place). */
export const searchesQueryKey = (matterId: number) =>
  ['matters', 'detail', matterId, 'search'] as const;
