import { createBatchFromDocuments } from '../batches/service';
import type { AppContext } from '../context';
import type { Actor } from './service';

/**
 * The sample as a validation batch (server/batches), in the drawn order and without
 * widening to families: a simple random sample must be coded exactly as drawn. The
 * sample row keeps the batch's id.
 */
export async function createSampleBatch(
  ctx: AppContext,
  matterId: number,
  actor: Actor,
  input: { sampleId: number; kind: string; documentIds: number[] },
): Promise<number | null> {
  if (input.documentIds.length === 0) return null;
  const { batch } = await createBatchFromDocuments(ctx, matterId, actor, {
    name: `${input.kind === 'elusion' ? 'Elusion' : 'Prevalence'} sample ${input.sampleId}`,
    kind: 'validation',
    documentIds: input.documentIds,
    keepFamilies: false,
    source: `validation sample ${input.sampleId}`,
    sourceDetail: { sampleId: input.sampleId, kind: input.kind },
  });
  await ctx.db
    .updateTable('validation_samples')
    .set({ batch_id: batch.id })
    .where('id', '=', input.sampleId)
    .execute();
  return batch.id;
}
