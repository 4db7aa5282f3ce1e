// Full index builds in worker threads (build-worker.mjs, build-core.ts), one per matter
// at a time: progress is reported to the job, an abort (shutdown) terminates the worker,
// and a worker that dies or runs out of memory rejects with a plain message.
import { Worker } from 'node:worker_threads';
import type { JobRun } from '../jobs/runner';
import type { BuildRequest, BuildSummary } from './build-core';

const WORKER_URL = new URL('./build-worker.mjs', import.meta.url);

interface ActiveBuild {
  worker: Worker;
  indexId: number;
}

export class BuildWorkers {
  private readonly builds = new Map<number, ActiveBuild>();

  run(request: BuildRequest, run: Pick<JobRun, 'progress' | 'signal'>): Promise<BuildSummary> {
    const matterId = request.matterId;
    return new Promise<BuildSummary>((resolve, reject) => {
      const worker = new Worker(WORKER_URL, { workerData: request });
      this.builds.set(matterId, { worker, indexId: request.indexId });
      let settled = false;
      const finish = (error: Error | null, summary?: BuildSummary) => {
        if (settled) return;
        settled = true;
        this.builds.delete(matterId);
        run.signal.removeEventListener('abort', onAbort);
        if (error) reject(error);
        else resolve(summary!);
      };
      const onAbort = () => void worker.terminate();
      run.signal.addEventListener('abort', onAbort);
      worker.on(
        'message',
        (message: { type: string; fraction?: number; result?: BuildSummary; message?: string }) => {
          if (message.type === 'progress' && typeof message.fraction === 'number') {
            void run
              .progress({
                progress: Math.round(message.fraction * 100),
                message:
                  message.fraction < 0.9 ? 'Computing the concept space' : 'Saving the new version',
              })
              .catch(() => undefined);
          } else if (message.type === 'done') finish(null, message.result);
          else if (message.type === 'error')
            finish(new Error(message.message ?? 'the build failed'));
        },
      );
      worker.on('error', (error: Error & { code?: string }) =>
        finish(
          new Error(
            error.code === 'ERR_WORKER_OUT_OF_MEMORY'
              ? 'the build ran out of memory'
              : `the build worker crashed: ${error.message}`,
          ),
        ),
      );
      worker.on('exit', (code) =>
        finish(new Error(`the build worker stopped before finishing (exit code ${code})`)),
      );
    });
  }

  /** Stops a running build's worker; the previous version keeps serving. */
  async terminate(matterId: number): Promise<boolean> {
    const build = this.builds.get(matterId);
    if (!build) return false;
    await build.worker.terminate();
    return true;
  }

  isBuilding(matterId: number): boolean {
    return this.builds.has(matterId);
  }

  async close(): Promise<void> {
    await Promise.allSettled([...this.builds.values()].map((b) => b.worker.terminate()));
  }
}
