import type { AppContext } from '../context';
import type { BuildIndexPayload } from '../indexing/service';
import type { JobHandler } from './runner';

/**
 * build-index: a full build of the matter's concept space in a worker thread; the new
 * version replaces the serving one in one transaction, or fails leaving it serving.
 */
export function buildIndexHandler(ctx: AppContext): JobHandler<BuildIndexPayload> {
  return {
    run: (run) => ctx.index.runBuild(run),
    async requeue(job) {
      // A half-built version is just failed; only a matter left with no index gets a new build.
      if (job.matter_id !== null && (await ctx.index.getIndex(job.matter_id)) === null)
        await ctx.index.queueBuild(job.matter_id, { reason: 'first build' });
    },
  };
}
