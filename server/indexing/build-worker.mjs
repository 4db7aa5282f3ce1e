// Worker-thread entry for a full index build. Plain JavaScript so it starts the same way
// under `node --import tsx`, Vitest and plain Node; tsx's API loads the TypeScript module.
import { parentPort, workerData } from 'node:worker_threads';
import { tsImport } from 'tsx/esm/api';

const core = await tsImport('./build-core.ts', import.meta.url);
try {
  const result = await core.buildIndexVersion(workerData, (fraction) =>
    parentPort.postMessage({ type: 'progress', fraction }),
  );
  parentPort.postMessage({ type: 'done', result });
} catch (error) {
  parentPort.postMessage({
    type: 'error',
    message: error instanceof Error ? error.message : String(error),
  });
}
