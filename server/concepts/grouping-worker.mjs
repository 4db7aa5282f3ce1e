// Worker-thread entry for one k-means grouping (grouping-core.ts). Plain JavaScript so it
// starts the same way under `node --import tsx`, Vitest and plain Node.
import { parentPort, workerData } from 'node:worker_threads';
import { tsImport } from 'tsx/esm/api';

const core = await tsImport('./grouping-core.ts', import.meta.url);
try {
  const groupingId = await core.groupingInWorker(workerData);
  parentPort.postMessage({ type: 'done', groupingId });
} catch (error) {
  parentPort.postMessage({
    type: 'error',
    message: error instanceof Error ? error.message : String(error),
  });
}
