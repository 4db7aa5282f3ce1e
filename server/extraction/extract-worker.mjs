// Worker-thread entry for extraction. Plain JavaScript so it starts the same way under
// `node --import tsx`, Vitest and plain Node; tsx's API loads the TypeScript module.
import { parentPort } from 'node:worker_threads';
import { tsImport } from 'tsx/esm/api';

const core = await tsImport('./extract-core.ts', import.meta.url);

parentPort.on('message', async (task) => {
  let result;
  try {
    result = await core.extractSniffed(task.filePath, task.sniffed, task.size, task.limits, {
      // A long step (one OCR page) restarts the pool's clock for this file.
      onLongStep: (ms) => parentPort.postMessage({ id: task.id, extendMs: ms }),
    });
  } catch (error) {
    result = {
      ok: false,
      kind: task.sniffed.kind,
      mime: task.sniffed.mime,
      reason: 'file could not be read',
    };
    void error;
  }
  parentPort.postMessage({ id: task.id, result });
});
parentPort.postMessage({ ready: true });
