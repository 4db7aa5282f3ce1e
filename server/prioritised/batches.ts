import { randomInt } from 'node:crypto';
import type { PrioritisedBatchResponse } from '../../shared/schemas/prioritised';
import { recordAudit } from '../audit/record';
import type { AppContext } from '../context';
import { prioritisedSelection, type Actor } from './service';

/** POST .../prioritised/batches: the next most likely responsive, with seeded random picks. */
export async function createPrioritisedBatch(
  ctx: AppContext,
  matterId: number,
  input: { size: number; randomShare: number; seed?: number; name?: string },
  actor: Actor,
): Promise<PrioritisedBatchResponse> {
  const seed = input.seed ?? randomInt(0, 2 ** 31 - 1);
  const { documents, model } = await prioritisedSelection(ctx, matterId, {
    size: input.size,
    randomShare: input.randomShare,
    seed,
  });
  // Review batches (review_batches) are not on this branch yet: the selection is
  // returned and audited, with batchId null.
  const batchId: number | null = null;
  await recordAudit(ctx.db, {
    actorId: actor.id,
    actorEmail: actor.email,
    ip: actor.ip,
    matterId,
    action: 'ranking.batch_created',
    targetType: 'batch',
    targetId: batchId,
    detail: {
      size: documents.length,
      random: documents.filter((d) => d.random).length,
      seed,
      modelVersion: model.version,
      positives: model.positives,
      negatives: model.negatives,
      trainedAt: model.trainedAt,
    },
  });
  return { batchId, modelVersion: model.version, seed, documents };
}
