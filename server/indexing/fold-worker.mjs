// Worker-thread entry for folding-in (fold-core.ts). Plain JavaScript so it starts the
// same way under `node --import tsx`, Vitest and plain Node; tsx's API loads the
// TypeScript module. One request at a time: { id, request } in, { id, vectors } or
// { id, error } out.
import { parentPort } from 'node:worker_threads';
import { tsImport } from 'tsx/esm/api';

const core = await tsImport('./fold-core.ts', import.meta.url);
parentPort.on('message', async ({ id, request }) => {
  try {
    const vectors = await core.foldWaiting(request);
    parentPort.postMessage(
      { id, vectors },
      vectors.map((v) => v.vector.buffer),
    );
  } catch (error) {
    parentPort.postMessage({ id, error: error instanceof Error ? error.message : String(error) });
  }
});
parentPort.postMessage({ ready: true });
