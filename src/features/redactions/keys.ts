/** Query keys of the redactions feature. */
export const redactionKeys = {
  document: (matterId: number, documentId: number) =>
    ['matters', 'detail', matterId, 'documents', documentId, 'redactions'] as const,
};
