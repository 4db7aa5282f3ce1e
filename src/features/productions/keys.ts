/** Query keys of the productions feature. */
export const productionKeys = {
  all: (matterId: number) => ['matters', 'detail', matterId, 'productions'] as const,
  detail: (matterId: number, productionId: number) =>
    ['matters', 'detail', matterId, 'productions', productionId] as const,
};
