import type { AppContext } from '../context';
import { queueTraining, type TrainPayload } from '../prioritised/service';
import { trainAndRank } from '../prioritised/training';
import type { JobHandler } from './runner';

/**
 * train-ranking: fits the matter's learned ranking on its Responsive / Not responsive
 * codes and re-scores every indexed document (server/prioritised/training.ts). Queued
 * after every RETRAIN_EVERY new codes, or on demand.
 */
export function trainRankingHandler(ctx: AppContext): JobHandler<TrainPayload> {
  return {
    async run(run) {
      const info = await trainAndRank(
        ctx,
        run.payload.matterId,
        run.payload.reason,
        (message, fraction) =>
          run.progress({ message, progress: Math.round(fraction * 100), total: 100 }),
      );
      return `Model ${info.version}: ${info.positives} Responsive, ${info.negatives} Not responsive; trained in ${Math.round(info.trainMs)} ms, ranked ${info.scored} documents in ${Math.round(info.rankMs)} ms`;
    },
    async requeue(_job, payload) {
      await queueTraining(ctx, payload.matterId, 'after a restart', null);
    },
  };
}
