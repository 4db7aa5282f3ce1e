// Worker-thread entry for production rendering. Plain JavaScript so it starts the same way
// under `node --import tsx`, Vitest and plain Node; tsx's API loads the TypeScript module.
import { parentPort } from 'node:worker_threads';
import { tsImport } from 'tsx/esm/api';

const core = await tsImport('./render-core.ts', import.meta.url);

parentPort.on('message', async ({ id, task }) => {
  try {
    const result = await core.renderDocument(task);
    parentPort.postMessage({ id, result }, [result.pdf.buffer]);
  } catch (error) {
    parentPort.postMessage({ id, error: error instanceof Error ? error.message : String(error) });
  }
});
parentPort.postMessage({ ready: true });
