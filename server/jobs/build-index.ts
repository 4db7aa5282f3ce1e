import type { AppContext } from '../context';
import type { BuildIndexPayload } from '../indexing/service';
import type { JobHandler } from './runner';

/** An interrupted build is queued again at most this many times in a row. */
export const MAX_BUILD_RESTARTS = 2;

/**
 * build-index: a full build of the matter's concept space in a worker thread; the new
 * version replaces the serving one in one transaction, or fails leaving it serving.
 */
export function buildIndexHandler(ctx: AppContext): JobHandler<BuildIndexPayload> {
  return {
    run: (run) => ctx.index.runBuild(run),
    async requeue(job, payload) {
      // The half-built version is failed (recoverInterrupted); the build it was doing is
      // queued again with the same request, unless restarts keep interrupting it (a build
      // that takes the process down would otherwise loop).
      if (job.matter_id === null) return;
      const restarts = (payload.restarts ?? 0) + 1;
      if (restarts > MAX_BUILD_RESTARTS && (await ctx.index.getIndex(job.matter_id)) !== null) {
        ctx.logger.error(
          { jobId: job.id, matterId: job.matter_id, restarts },
          'an index build was interrupted by restarts too often; not queued again',
        );
        return;
      }
      await ctx.index.queueBuild(job.matter_id, { ...payload, restarts });
    },
  };
}
