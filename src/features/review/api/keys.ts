/** Every cached review document of a matter: [...reviewsQueryKey(matterId), docId, {q, mode}]. */
export const reviewsQueryKey = (matterId: number) =>
  ['matters', 'detail', matterId, 'review'] as const;
