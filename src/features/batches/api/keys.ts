export const batchesQueryKey = (matterId: number) =>
  ['matters', 'detail', matterId, 'batches'] as const;
