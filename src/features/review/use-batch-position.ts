import type { ReviewPosition } from './use-review-position';
import { useBatch } from '../batches/api/get-batch';

/** Where the open document sits in the batch being worked, with the neighbours' addresses. */
export function useBatchPosition(
  matterId: number,
  batchId: number | null,
  docId: number,
): (ReviewPosition & { batchName: string; complete: number }) | null {
  const batch = useBatch(matterId, batchId);
  if (batchId === null || !batch.data) return null;
  const docs = batch.data.documents;
  const at = docs.findIndex((d) => d.id === docId);
  if (at < 0) return null;
  const href = (i: number) =>
    i >= 0 && i < docs.length ? `/matters/${matterId}/review/${docs[i].id}?batch=${batchId}` : null;
  return {
    position: at,
    total: docs.length,
    previousHref: href(at - 1),
    nextHref: href(at + 1),
    batchName: batch.data.batch.name,
    complete: batch.data.batch.progress.complete,
  };
}
