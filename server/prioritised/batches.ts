import { randomInt } from 'node:crypto';
import type { PrioritisedBatchResponse } from '../../shared/schemas/prioritised';
import { recordAudit } from '../audit/record';
import { createBatchFromDocuments } from '../batches/service';
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
  // A review batch in ranked order; families stay whole as in every review batch, and
  // documents already in an open review batch are left out by createBatchFromDocuments.
  const { batch } = await createBatchFromDocuments(ctx, matterId, actor, {
    name: input.name ?? `Prioritised: next ${documents.length} (model ${model.version})`,
    kind: 'review',
    documentIds: documents.map((d) => d.documentId),
    keepFamilies: true,
    source: `prioritised review, model ${model.version}`,
    sourceDetail: { seed, randomShare: input.randomShare, modelVersion: model.version },
  });
  const batchId = batch.id;
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
