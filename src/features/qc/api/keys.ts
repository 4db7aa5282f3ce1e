export const qcQueryKey = (matterId: number) => ['matters', 'detail', matterId, 'qc'] as const;
