// concept-grouping: one k-means grouping computed in a worker thread (grouping-core.ts),
// so the seconds it takes over a large matter never hold up other requests.
import { Worker } from 'node:worker_threads';
import type { JobHandler } from '../jobs/runner';
import { JobAborted } from '../jobs/runner';
import type { GroupingRequest } from './grouping-core';

const WORKER_URL = new URL('./grouping-worker.mjs', import.meta.url);

export type GroupingPayload = GroupingRequest;

function runInWorker(
  request: GroupingRequest & { dbFile: string },
  signal: AbortSignal,
): Promise<number> {
  return new Promise<number>((resolve, reject) => {
    const worker = new Worker(WORKER_URL, { workerData: request });
    let settled = false;
    const finish = (error: Error | null, id?: number) => {
      if (settled) return;
      settled = true;
      signal.removeEventListener('abort', onAbort);
      if (error) reject(error);
      else resolve(id!);
    };
    const onAbort = () => {
      void worker.terminate();
      finish(new JobAborted());
    };
    signal.addEventListener('abort', onAbort);
    worker.on('message', (m: { type: string; groupingId?: number; message?: string }) => {
      if (m.type === 'done') finish(null, m.groupingId);
      else finish(new Error(m.message ?? 'the grouping failed'));
    });
    worker.on('error', (error: Error & { code?: string }) =>
      finish(
        new Error(
          error.code === 'ERR_WORKER_OUT_OF_MEMORY'
            ? 'the grouping ran out of memory'
            : `the grouping worker crashed: ${error.message}`,
        ),
      ),
    );
    worker.on('exit', (code) =>
      finish(new Error(`the grouping worker stopped before finishing (exit code ${code})`)),
    );
  });
}

export function conceptGroupingHandler(dbFile: string): JobHandler<GroupingPayload> {
  return {
    async run({ payload, signal, progress }) {
      await progress({ progress: 0, total: 1, message: `Grouping into ${payload.groups} groups` });
      const id = await runInWorker({ ...payload, dbFile }, signal);
      await progress({ progress: 1 });
      return `Grouping ${id} ready`;
    },
    // An interrupted grouping is simply asked for again by whoever wants it.
  };
}
