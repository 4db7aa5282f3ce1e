import type { AppContext } from '../context';
import type { Actor } from './service';

/**
 * The sample as a review batch. Review batches (review_batches, built in parallel on
 * another branch) are not on this branch yet, so no batch is made and the sample's
 * documents stay in validation_sample_documents; the API returns batchId null.
 */
export async function createSampleBatch(
  _ctx: AppContext,
  _matterId: number,
  _actor: Actor,
  _input: { sampleId: number; kind: string; documentIds: number[] },
): Promise<number | null> {
  return null;
}
